import "server-only";

/**
 * The OpenAPI 3.1 description of Tributary's JSON API, served at /api/openapi and rendered at
 * /api-docs. One section per area: add yours to `sections` (its tag, paths and schemas); shared
 * pieces (errors, security, parameters) are at the top.
 */

type Json = Record<string, unknown>;
type Section = { tag: { name: string; description: string }; paths: Json; schemas: Json };

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const jsonBody = (schema: Json, description?: string) => ({
  ...(description ? { description } : {}),
  content: { "application/json": { schema } },
});
const error = (description: string) => jsonBody(ref("Error"), description);
const idParameter = (what: string) => ({ name: "id", in: "path", required: true, description: `The ${what}'s id`, schema: { type: "string", format: "uuid" } });

/** The answers every authenticated route can give besides its own. */
const commonErrors = {
  "401": error("Not signed in, or the API token is unknown, revoked or expired."),
  "403": error("Your roles in this workspace do not allow this."),
  "503": error("The database is not answering."),
};

const shared: Json = {
  Error: {
    type: "object",
    description: "Every JSON error. `details` carry `path` (dotted), and `row`/`column` for files.",
    required: ["error", "details"],
    properties: {
      error: { type: "string", description: "A plain sentence for people." },
      details: {
        type: "array",
        items: {
          type: "object",
          required: ["message"],
          properties: { path: { type: "string" }, message: { type: "string" }, row: { type: "integer" }, column: { type: "string" } },
          additionalProperties: true,
        },
      },
    },
    example: { error: "The request body is not valid.", details: [{ path: "level", message: "level must be below 1" }] },
  },
  Job: {
    type: "object",
    description: "A background job (a large upload or fit) the client polls.",
    required: ["id", "kind", "status"],
    properties: {
      id: { type: "string", format: "uuid" },
      kind: { type: "string", enum: ["dataset.ingest", "fit.run"] },
      status: { type: "string", enum: ["queued", "running", "succeeded", "failed"] },
      progress: {
        type: ["object", "null"],
        properties: { phase: { type: "string" }, done: { type: "number" }, total: { type: ["number", "null"] }, message: { type: "string" } },
      },
      result: { type: ["object", "null"], description: "For fit.run: `{ fitId, n, rSquared }`.", additionalProperties: true },
      error: {
        type: ["object", "null"],
        properties: { message: { type: "string" }, details: { type: "array", items: { type: "object" } } },
      },
      createdAt: { type: "string", format: "date-time" },
      startedAt: { type: ["string", "null"], format: "date-time" },
      finishedAt: { type: ["string", "null"], format: "date-time" },
      links: { type: "object", properties: { self: { type: "string" }, fit: { type: "string" }, page: { type: "string" } } },
    },
  },
};

// ---------------------------------------------------------------------------------------------
// Fits

const nullableNumber = { type: ["number", "null"] };

const fits: Section = {
  tag: {
    name: "Fits",
    description:
      "Multiple linear regressions of an outcome on spend channels and controls. States: draft → in_review → approved or changes_requested (→ in_review again) → retired. Approved fits are frozen: the database refuses any change to their numbers or their data.",
  },
  schemas: {
    FitRequest: {
      type: "object",
      required: ["datasetId", "outcome", "terms"],
      additionalProperties: false,
      properties: {
        datasetId: { type: "string", format: "uuid", description: "A spend history of this workspace with its column roles assigned." },
        name: { type: "string", maxLength: 200, description: "Default: \"<outcome> on N channels, M controls\"." },
        outcome: { type: "string", description: "The outcome column, e.g. sales_eur." },
        terms: {
          type: "array",
          maxItems: 60,
          description: "Spend channels (a column name: linear) or terms with a transform and role.",
          items: {
            oneOf: [
              { type: "string" },
              {
                type: "object",
                required: ["column"],
                additionalProperties: false,
                properties: {
                  column: { type: "string" },
                  transform: { type: "string", enum: ["none", "log1p"], default: "none", description: "log1p: log(1 + x), diminishing returns (spend only)." },
                  role: { type: "string", enum: ["spend", "control"], default: "spend" },
                },
              },
            ],
          },
        },
        controls: { type: "array", items: { type: "string" }, default: [], description: "Control columns (enter linearly; planners hold them fixed)." },
        interactions: {
          type: "array",
          default: [],
          description: "Pairwise interactions of term columns: `[\"a\", \"b\"]` or `{ \"columns\": [\"a\", \"b\"] }`.",
          items: {
            oneOf: [
              { type: "array", items: { type: "string" }, minItems: 2, maxItems: 2 },
              { type: "object", required: ["columns"], properties: { columns: { type: "array", items: { type: "string" }, minItems: 2, maxItems: 2 } } },
            ],
          },
        },
        intercept: { type: "boolean", default: true },
        level: { type: "number", exclusiveMinimum: 0.5, exclusiveMaximum: 1, default: 0.95, description: "Confidence level of the coefficient intervals." },
        covariance: {
          description: "Covariance of the estimates: classical, HC3 (unequal variances) or Newey–West (autocorrelation; lag default ⌊4(n/100)^(2/9)⌋).",
          default: { type: "classical" },
          oneOf: [
            { type: "string", enum: ["classical", "hc3", "newey-west"] },
            {
              type: "object",
              required: ["type"],
              properties: { type: { type: "string", enum: ["classical", "hc3", "newey-west"] }, lag: { type: "integer", minimum: 0 } },
            },
          ],
        },
      },
      example: {
        datasetId: "5b0f3c1e-2a8d-4d7e-9a51-3f2b7e1c9d40",
        outcome: "sales_eur",
        terms: ["search_eur", "social_eur", { column: "video_eur", transform: "log1p" }],
        controls: ["promo_week"],
        intercept: true,
        level: 0.95,
        covariance: { type: "newey-west", lag: 4 },
      },
    },
    Coefficient: {
      type: "object",
      required: ["term", "kind", "estimate", "stdError", "tStatistic", "pValue", "ciLow", "ciHigh", "vif"],
      properties: {
        term: { type: "string", description: "\"(Intercept)\", a column, log1p(column) or a:b." },
        kind: { type: "string", enum: ["intercept", "linear", "control", "log1p", "power", "interaction"] },
        columns: { type: "array", items: { type: "string" } },
        estimate: nullableNumber,
        stdError: nullableNumber,
        tStatistic: nullableNumber,
        pValue: { ...nullableNumber, description: "Two-sided, Student's t with dfResidual degrees of freedom." },
        ciLow: { ...nullableNumber, description: "Lower end of the confidence interval at `level`." },
        ciHigh: nullableNumber,
        vif: { ...nullableNumber, description: "Variance inflation factor (null for the intercept). Above 5 and 10: common warning thresholds." },
        aliased: { type: "boolean" },
      },
    },
    FitReport: {
      type: "object",
      description: "Every statistic is computed on all rows; plot data in `diagnostics` is sampled beyond a few thousand rows.",
      properties: {
        outcome: { type: "string" },
        units: { type: "object", additionalProperties: { type: ["string", "null"] }, description: "Unit or currency of each column used." },
        periodColumn: { type: ["string", "null"] },
        intercept: { type: "boolean" },
        level: { type: "number" },
        covariance: { type: "object", properties: { type: { type: "string" }, lag: { type: ["integer", "null"] } } },
        n: { type: "integer" },
        parameterCount: { type: "integer" },
        rank: { type: "integer" },
        dfModel: { type: "integer" },
        dfResidual: { type: "integer" },
        coefficients: { type: "array", items: ref("Coefficient") },
        rSquared: { type: "number" },
        adjRSquared: { type: "number" },
        rSquaredUncentred: { type: "boolean", description: "True without an intercept (R² = 1 − RSS/Σy², not comparable with a centred R²)." },
        sigma: { type: "number", description: "Residual standard error, in the outcome's unit." },
        fStatistic: nullableNumber,
        fPValue: nullableNumber,
        fTestKind: { type: "string", enum: ["anova", "wald"] },
        fDf: { type: "array", items: { type: "integer" }, minItems: 2, maxItems: 2 },
        durbinWatson: nullableNumber,
        logLik: { type: "number" },
        aic: { type: "number" },
        bic: { type: "number" },
        conditionNumber: { type: "number" },
        collinearity: {
          type: "object",
          properties: {
            terms: { type: "array", items: { type: "string" } },
            correlations: { type: "array", items: { type: "array", items: { type: "number" } } },
            vif: { type: "array", items: { type: "number" } },
            centred: { type: "boolean" },
          },
        },
        diagnostics: { type: "object", description: "Residuals, leverages, Cook's distances, Q–Q and time-series points for plots.", additionalProperties: true },
        warnings: { type: "array", items: { type: "string" } },
        recordChecksum: { type: "string", description: "sha256 of the stored fit record (what prediction reads)." },
      },
    },
    TrailEntry: {
      type: "object",
      properties: {
        id: { type: "integer" },
        at: { type: "string", format: "date-time" },
        action: { type: "string", enum: ["fit.created", "fit.refitted", "fit.submitted", "fit.approved", "fit.changes_requested", "fit.retired"] },
        actorName: { type: ["string", "null"] },
        actorEmail: { type: ["string", "null"] },
        from: { type: ["string", "null"] },
        to: { type: ["string", "null"] },
        comment: { type: ["string", "null"] },
      },
    },
    Fit: {
      allOf: [
        {
          type: "object",
          required: ["id", "name", "status", "datasetId"],
          properties: {
            id: { type: "string", format: "uuid" },
            name: { type: "string" },
            status: { type: "string", enum: ["draft", "in_review", "changes_requested", "approved", "retired"] },
            datasetId: { type: "string", format: "uuid" },
            datasetName: { type: ["string", "null"] },
            authorId: { type: ["string", "null"] },
            authorName: { type: ["string", "null"] },
            approvedBy: { type: ["string", "null"] },
            approvedByName: { type: ["string", "null"] },
            createdAt: { type: "string", format: "date-time" },
            updatedAt: { type: "string", format: "date-time" },
            submittedAt: { type: ["string", "null"], format: "date-time" },
            approvedAt: { type: ["string", "null"], format: "date-time" },
            retiredAt: { type: ["string", "null"], format: "date-time" },
            request: { type: "object", description: "The request as normalised (terms with transform and role)." },
            specification: { type: "object", description: "The engine's model specification." },
            trail: { type: "array", items: ref("TrailEntry"), description: "GET /api/fits/{id} only." },
            links: { type: "object", properties: { self: { type: "string" }, page: { type: "string" } } },
          },
        },
        ref("FitReport"),
      ],
    },
    FitSummary: {
      type: "object",
      properties: {
        id: { type: "string", format: "uuid" },
        name: { type: "string" },
        status: { type: "string" },
        datasetId: { type: "string" },
        datasetName: { type: ["string", "null"] },
        outcome: { type: "string" },
        termCount: { type: "integer" },
        n: { type: "integer" },
        rSquared: { type: "number" },
        authorName: { type: ["string", "null"] },
        updatedAt: { type: "string", format: "date-time" },
      },
    },
    ReviewRequest: {
      type: "object",
      required: ["decision"],
      additionalProperties: false,
      properties: {
        decision: { type: "string", enum: ["approve", "request-changes"] },
        comment: { type: "string", maxLength: 4000, description: "Required with request-changes." },
      },
      example: { decision: "request-changes", comment: "Try log(1 + x) on search; the residuals curve at high spend." },
    },
    CommentRequest: { type: "object", additionalProperties: false, properties: { comment: { type: "string", maxLength: 4000 } } },
  },
  paths: {
    "/api/fits": {
      get: {
        tags: ["Fits"],
        summary: "List the workspace's fits",
        description: "Permission fit:read. Newest change first.",
        parameters: [
          {
            name: "status",
            in: "query",
            required: false,
            description: "Only fits in these states (repeat the parameter for several).",
            schema: { type: "string", enum: ["draft", "in_review", "changes_requested", "approved", "retired"] },
          },
        ],
        responses: {
          "200": jsonBody({ type: "object", properties: { fits: { type: "array", items: ref("FitSummary") } } }, "The fits."),
          "422": error("Unknown status."),
          ...commonErrors,
        },
      },
      post: {
        tags: ["Fits"],
        summary: "Build and fit a model (a draft)",
        description:
          "Permission fit:create (analysts). Datasets up to 50,000 rows are fitted at once (201 with the whole report); larger ones run in the worker (202 with a job to poll at GET /api/jobs/{id}; its result names the fit).",
        requestBody: { required: true, ...jsonBody(ref("FitRequest")) },
        responses: {
          "201": jsonBody(ref("Fit"), "The draft fit with its whole report."),
          "202": jsonBody({ type: "object", properties: { job: ref("Job") } }, "Queued: poll the job."),
          "409": error("The dataset's column roles are not assigned yet."),
          "422": error("Invalid body, unknown columns, or the engine refuses (n ≤ terms, aliased terms — named —, constant outcome)."),
          ...commonErrors,
        },
      },
    },
    "/api/fits/{id}": {
      get: {
        tags: ["Fits"],
        summary: "One fit with its report and review trail",
        description: "Permission fit:read.",
        parameters: [idParameter("fit")],
        responses: { "200": jsonBody(ref("Fit"), "The fit."), "404": error("No such fit in this workspace."), ...commonErrors },
      },
      put: {
        tags: ["Fits"],
        summary: "Refit the author's draft",
        description: "Permission fit:create, author only, while draft or changes_requested. Same body and answers as POST /api/fits (200 instead of 201).",
        parameters: [idParameter("fit")],
        requestBody: { required: true, ...jsonBody(ref("FitRequest")) },
        responses: {
          "200": jsonBody(ref("Fit"), "The refitted draft."),
          "202": jsonBody({ type: "object", properties: { job: ref("Job") } }, "Queued: poll the job."),
          "404": error("No such fit in this workspace."),
          "409": error("The fit is in review, approved or retired."),
          "422": error("Invalid body or the engine refuses."),
          ...commonErrors,
        },
      },
    },
    "/api/fits/{id}/submit": {
      post: {
        tags: ["Fits"],
        summary: "Send a draft for review",
        description: "Permission fit:submit; only the fit's author; from draft or changes_requested to in_review. E-mails the reviewers.",
        parameters: [idParameter("fit")],
        requestBody: { required: false, ...jsonBody(ref("CommentRequest")) },
        responses: {
          "200": jsonBody(ref("Fit"), "The fit, now in review."),
          "404": error("No such fit in this workspace."),
          "409": error("Not a draft or a fit with changes requested."),
          ...commonErrors,
        },
      },
    },
    "/api/fits/{id}/review": {
      post: {
        tags: ["Fits"],
        summary: "Approve, or request changes",
        description:
          "Permission fit:review. Approving is refused (403) to the fit's author, whatever their roles. A request for changes needs a comment. E-mails the author and the reviewers.",
        parameters: [idParameter("fit")],
        requestBody: { required: true, ...jsonBody(ref("ReviewRequest")) },
        responses: {
          "200": jsonBody(ref("Fit"), "The fit, approved (frozen) or with changes requested."),
          "403": error("Not a reviewer, or the reviewer built this fit."),
          "404": error("No such fit in this workspace."),
          "409": error("The fit is not in review."),
          "422": error("Unknown decision, or no comment with request-changes."),
          "401": commonErrors["401"],
          "503": commonErrors["503"],
        },
      },
    },
    "/api/fits/{id}/retire": {
      post: {
        tags: ["Fits"],
        summary: "Retire a fit",
        description: "Permission fit:retire (analysts and reviewers). Any state but retired. A retired fit stays frozen.",
        parameters: [idParameter("fit")],
        requestBody: { required: false, ...jsonBody(ref("CommentRequest")) },
        responses: {
          "200": jsonBody(ref("Fit"), "The fit, now retired."),
          "404": error("No such fit in this workspace."),
          "409": error("Already retired."),
          ...commonErrors,
        },
      },
    },
  },
};

// ---------------------------------------------------------------------------------------------
// Jobs

const jobs: Section = {
  tag: { name: "Jobs", description: "Background work (large uploads and fits) run by the worker; poll until succeeded or failed." },
  schemas: {},
  paths: {
    "/api/jobs/{id}": {
      get: {
        tags: ["Jobs"],
        summary: "Status, progress and result of a job",
        description: "Any member of the workspace. Poll every second or so.",
        parameters: [idParameter("job")],
        responses: { "200": jsonBody(ref("Job"), "The job."), "404": error("No such job in this workspace."), ...commonErrors },
      },
    },
  },
};

/** Areas in the order the documentation lists them; add yours here. */
const sections: Section[] = [fits, jobs];

export const openApiDocument = {
  openapi: "3.1.0",
  info: {
    title: "Tributary API",
    version: "1",
    description:
      "JSON over HTTPS. Authenticate with a personal API token (Settings → API tokens) as `Authorization: Bearer trib_…`; it acts in its workspace with your roles. Browsers use the session cookie. Errors are always `{ \"error\": string, \"details\": [...] }`.",
  },
  servers: [{ url: "/", description: "This server" }],
  security: [{ bearerToken: [] }, { sessionCookie: [] }],
  tags: sections.map((section) => section.tag),
  paths: Object.assign({}, ...sections.map((section) => section.paths)) as Json,
  components: {
    securitySchemes: {
      bearerToken: { type: "http", scheme: "bearer", description: "A personal API token (trib_…)." },
      sessionCookie: { type: "apiKey", in: "cookie", name: "authjs.session-token", description: "Signed-in browsers." },
    },
    schemas: Object.assign({}, shared, ...sections.map((section) => section.schemas)) as Json,
  },
};

export type OpenApiDocument = typeof openApiDocument;
