import { z } from "zod";
import { compareFits, loadFitsToCompare, MAX_COMPARED_FITS } from "@/server/fits/comparison";
import { apiRoute } from "@/server/http/route";

/** `ids` repeated (`?ids=a&ids=b`) or comma-separated (`?ids=a,b`): 2–4 distinct fit ids. */
const compareQuerySchema = z
  .object({
    ids: z
      .union([z.string(), z.array(z.string())])
      .transform((value) => [...new Set((Array.isArray(value) ? value : [value]).flatMap((part) => part.split(",")).map((part) => part.trim()).filter(Boolean))])
      .pipe(z.array(z.uuid("Each id must be a fit id (a UUID).")).min(2, "Give at least two different fits.").max(MAX_COMPARED_FITS, `Give at most ${MAX_COMPARED_FITS} fits.`)),
  })
  .strict();

/**
 * 2–4 fits side by side: whole-model figures (the best marked only among fits of the same rows) and every
 * term's estimate with its interval, naming terms that shift between fits. A fit of another workspace is 404.
 */
export const GET = apiRoute({ permission: "fit:read", query: compareQuerySchema }, async ({ actor, query }) => compareFits(await loadFitsToCompare(actor, query.ids)));
