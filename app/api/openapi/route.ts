import { openApiDocument } from "@/server/api-docs/openapi";
import { apiRoute } from "@/server/http/route";

/** The OpenAPI 3.1 document (public: it describes the API, it holds no data). */
export const GET = apiRoute({ auth: false }, () => openApiDocument);
