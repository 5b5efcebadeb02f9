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
        description:
          "The latest step: `done` of `total` (null when unknown). dataset.ingest: phases `Checking rows` and `Storing` in bytes of the file, then `Stored`. fit.run: on a scale of 0 to 100, `Checking the request` (0), `Reading rows` (5 to 60, column by column, the message counting rows and columns read), `Solving` (60), `Diagnostics` (80), `Storing` (90), `Stored` (100).",
        properties: { phase: { type: "string" }, done: { type: "number" }, total: { type: ["number", "null"] }, message: { type: "string" } },
      },
      result: { type: ["object", "null"], description: "For fit.run: `{ fitId, n, rSquared }`; for dataset.ingest: `{ datasetId, name, status, rowCount, columnCount, sha256, notes }`.", additionalProperties: true },
      error: {
        type: ["object", "null"],
        properties: { message: { type: "string" }, details: { type: "array", items: { type: "object" } } },
      },
      createdAt: { type: "string", format: "date-time" },
      startedAt: { type: ["string", "null"], format: "date-time" },
      finishedAt: { type: ["string", "null"], format: "date-time" },
      links: {
        type: "object",
        required: ["self"],
        description:
          "Where the job and, once it has `succeeded`, its outcome live. A succeeded `dataset.ingest` has `dataset` and `page`; a succeeded `fit.run` has `fit` and `page`. Queued, running and failed jobs have only `self`.",
        properties: {
          self: { type: "string", description: "This job: `/api/jobs/{id}`.", example: "/api/jobs/0b7c7f1e-2a4d-4c1e-9f3a-5d6e7f8a9b0c" },
          dataset: { type: "string", description: "dataset.ingest: the stored spend history, `/api/datasets/{datasetId}`." },
          fit: { type: "string", description: "fit.run: the stored fit, `/api/fits/{fitId}`." },
          page: {
            type: "string",
            description:
              "The page the browser opens: `/fits/{fitId}`; `/datasets/{datasetId}`, or `/datasets/{datasetId}/roles` while the history still needs its column roles (`result.status` `needs-roles`).",
          },
        },
      },
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
        residualTests: {
          type: "object",
          description: "Tests on the residuals (absent from fits built before they were added).",
          properties: {
            heteroskedasticity: {
              type: ["object", "null"],
              description: "Breusch–Pagan, Koenker's studentized form: n·R² of r² on the regressors, χ² with df degrees of freedom. Null without an intercept.",
              properties: { statistic: { type: "number" }, df: { type: "integer" }, pValue: { type: "number" } },
            },
            normality: {
              type: ["object", "null"],
              description: "Jarque–Bera from the residuals' skewness and kurtosis (3 for normal errors), χ² with 2 degrees of freedom.",
              properties: { statistic: { type: "number" }, pValue: { type: "number" }, skewness: { type: "number" }, kurtosis: { type: "number" } },
            },
          },
        },
        periodCoverage: {
          type: ["object", "null"],
          description: "Whether the fitted rows' periods come at one steady step: step (days or periods), gaps ({after, before, missing}), missing. Null without a period column; absent from older fits.",
          additionalProperties: true,
        },
        holdout: {
          type: "object",
          description:
            "The latest rows (13, at most a fifth) predicted by a refit without them: status \"done\" with periods, trainedOn, level, rows (label, actual, predicted, lower, upper, inside, extrapolating), inside, fewerInsideThanExpected, meanAbsoluteError, rootMeanSquaredError, meanAbsolutePercentageError; or status \"skipped\" with a reason. Absent from fits built before the check was added.",
          additionalProperties: true,
        },
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
        description:
          "Any member of the workspace. Poll every second or so until `succeeded` or `failed`. A succeeded job links what it made: `links.dataset` (dataset.ingest) or `links.fit` (fit.run), and `links.page`, the page to open.",
        parameters: [idParameter("job")],
        responses: { "200": jsonBody(ref("Job"), "The job."), "404": error("No such job in this workspace."), ...commonErrors },
      },
    },
  },
};

// ---------------------------------------------------------------------------------------------
// Scenarios and predictions (issue 5)

const amounts = (description: string) => ({ type: "object", additionalProperties: { type: "number" }, description });
const interval = (description: string) => ({
  type: "object",
  description,
  required: ["mean", "confidence", "prediction"],
  properties: {
    mean: { type: "number" },
    confidence: { type: "array", items: { type: "number" }, minItems: 2, maxItems: 2, description: "[low, high] for the expected value." },
    prediction: { type: "array", items: { type: "number" }, minItems: 2, maxItems: 2, description: "[low, high] for the realised value." },
  },
});
const planProperties = {
  allocation: amounts("Spend per channel for the whole horizon, in the workspace currency (cents at most). Every channel of the fit, 0 if none."),
  controls: amounts("Controls over the horizon: for an on/off control the number of periods it is on (e.g. 4 promotion weeks of 13), otherwise its value per period."),
  horizon: { type: "integer", minimum: 1, maximum: 520, description: "Periods (e.g. weeks) the plan covers; each channel's amount is spread evenly (amount ÷ horizon per period)." },
};
const versionNumberParameter = { name: "n", in: "path", required: true, description: "Version number (1, 2, …)", schema: { type: "integer", minimum: 1 } };

const scenarios: Section = {
  tag: {
    name: "Scenarios",
    description:
      "Budget plans on approved fits, each save an immutable numbered version, and the predictions they read. Planners write; planners, finance, reviewers and admins read. Every prediction is an association from past data, and the intervals assume the fitted model still describes the market.",
  },
  schemas: {
    Plan: { type: "object", required: ["allocation", "horizon"], properties: planProperties },
    PredictRequest: {
      type: "object",
      required: ["allocation", "horizon"],
      properties: {
        ...planProperties,
        level: { type: "number", exclusiveMinimum: 0.5, exclusiveMaximum: 1, description: "Confidence level of both intervals; default the fit's (0.95)." },
        compareTo: { ...ref("Plan"), description: "Another plan (e.g. the starting one): the answer then has `difference`." },
      },
      example: { allocation: { search_eur: 260000, social_eur: 130000, video_eur: 143000, display_eur: 91000, podcast_eur: 65000, email_eur: 31200 }, controls: { promo_week: 2 }, horizon: 13, level: 0.95 },
    },
    ScenarioWarning: {
      type: "object",
      description:
        "`outside-range` (Beyond observed range): a channel or control outside what the fit saw, with the distance per period and over the horizon. `hidden-extrapolation` (Unseen combination): every column inside its range but the mix never seen (leverage above the largest of the history). Either way the model has no data there; treat the number as a guess. Warnings never block a save.",
      required: ["kind", "message"],
      properties: {
        kind: { type: "string", enum: ["outside-range", "hidden-extrapolation"] },
        message: { type: "string" },
        column: { type: "string" },
        label: { type: "string" },
        role: { type: "string", enum: ["channel", "control"] },
        direction: { type: "string", enum: ["above", "below"] },
        value: { type: "number", description: "Per period." },
        minimum: { type: "number" },
        maximum: { type: "number" },
        beyondPerPeriod: { type: "number" },
        beyondPerHorizon: { type: "number" },
        leverage: { type: "number" },
        maxTrainingLeverage: { type: "number" },
        terms: { type: "array", items: { type: "string" } },
      },
    },
    Prediction: {
      type: "object",
      required: ["perPeriod", "horizonTotal", "leverage", "maxTrainingLeverage", "warnings", "contributions"],
      properties: {
        fitId: { type: "string", format: "uuid" },
        checksum: { type: "string", description: "The fit record the numbers come from." },
        level: { type: "number" },
        horizon: { type: "integer" },
        periodNoun: { type: "string", example: "week" },
        perPeriod: interval("An average period: the total ÷ horizon; its prediction interval is for one new period at that plan."),
        horizonTotal: interval("The total over the horizon. Prediction variance H·s² + aᵀVa (a = sum of the periods' design rows), not one period's interval times H."),
        leverage: { type: "number", description: "Largest h₀ = x₀ᵀ(XᵀX)⁻¹x₀ among the plan's periods." },
        maxTrainingLeverage: { type: "number", description: "Largest leverage in the history: above it the plan is an unseen combination." },
        warnings: { type: "array", items: ref("ScenarioWarning") },
        contributions: {
          type: "array",
          description: "Coefficient × the term's value over the horizon (an association, not the effect of changing one channel alone).",
          items: { type: "object", properties: { term: { type: "string" }, label: { type: "string" }, value: { type: "number" }, perPeriod: { type: "number" } } },
        },
        difference: {
          type: "object",
          description: "With `compareTo`: this plan's expected total minus the other's, with its own confidence interval from the covariance (dᵀVd).",
          properties: { mean: { type: "number" }, confidence: { type: "array", items: { type: "number" } }, baselineTotal: { type: "number" } },
        },
      },
    },
    Scenario: {
      type: "object",
      properties: {
        id: { type: "string", format: "uuid" },
        name: { type: "string" },
        fitId: { type: "string", format: "uuid" },
        fitName: { type: "string" },
        fitStatus: { type: "string" },
        ownerName: { type: ["string", "null"] },
        horizon: { type: "integer" },
        latestVersion: { type: ["integer", "null"] },
        latestSavedAt: { type: ["string", "null"], format: "date-time" },
        baseline: { type: "object", description: "The starting plan (what `difference` is measured against): allocation, controls, horizon, source, description, total." },
        versions: { type: "array", items: { type: "object", description: "number, mode, total, horizon, note, authorName, createdAt, basedOn, restoredFrom, horizonTotal, warningKinds" } },
      },
    },
    SaveVersionRequest: {
      type: "object",
      required: ["baseVersion"],
      properties: {
        baseVersion: { type: "integer", minimum: 0, description: "The version you started from (0 before the first save). If a later version exists: 409." },
        note: { type: "string", maxLength: 2000 },
        restoreFrom: { type: "integer", minimum: 1, description: "Save a copy of this older version as the new one (the plan fields are then ignored)." },
        mode: { type: "string", enum: ["fixed", "growing"] },
        ...planProperties,
        total: { type: "number", description: "Fixed mode: the amounts must add up to it (±0.01)." },
        ceiling: { type: ["number", "null"], description: "Growing mode: the total may rise up to it." },
        settings: { type: "object", description: "Per channel `{ locked, floorCents, ceilingCents }`.", additionalProperties: { type: "object" } },
      },
    },
    ScenarioVersion: {
      type: "object",
      description: "Immutable. `prediction` is the server's, computed at save time against the scenario's starting plan.",
      properties: {
        scenarioId: { type: "string", format: "uuid" },
        number: { type: "integer" },
        mode: { type: "string", enum: ["fixed", "growing"] },
        ...planProperties,
        total: { type: "number" },
        ceiling: { type: ["number", "null"] },
        prediction: ref("Prediction"),
        warnings: { type: "array", items: ref("ScenarioWarning") },
        fitChecksum: { type: "string" },
        note: { type: "string" },
        authorName: { type: ["string", "null"] },
        createdAt: { type: "string", format: "date-time" },
        basedOn: { type: ["integer", "null"] },
        restoredFrom: { type: ["integer", "null"] },
      },
    },
  },
  paths: {
    "/api/fits/compare": {
      get: {
        tags: ["Fits"],
        summary: "Two to four fits side by side",
        description:
          "Whole-model figures (R², adjusted R², σ, AIC, BIC, residual checks, the held-out check) with the best marked only when the fits share outcome and rows (`sameRows`), every term's estimate, interval and p-value per fit (null where a fit leaves the term out), and `shiftingTerms`: terms whose estimate changes sign or moves by more than half its interval between fits.",
        parameters: [
          {
            name: "ids",
            in: "query",
            required: true,
            description: "2–4 fit ids, comma-separated or repeated",
            schema: { type: "array", items: { type: "string", format: "uuid" }, minItems: 2, maxItems: 4 },
            style: "form",
            explode: true,
          },
        ],
        responses: {
          "200": jsonBody({ type: "object", additionalProperties: true }, "fits, sameRows, summary, terms, shiftingTerms."),
          "404": error("A fit is not in this workspace."),
          "422": error("Fewer than two or more than four fits, or an id that is not a UUID."),
          ...commonErrors,
        },
      },
    },
    "/api/fits/{id}/predict": {
      post: {
        tags: ["Scenarios"],
        summary: "Predict a plan's outcome on an approved fit",
        description: "Roles with fit:predict (planners, analysts, reviewers). No database round trip once the fit is warm.",
        parameters: [idParameter("fit")],
        requestBody: { required: true, ...jsonBody(ref("PredictRequest")) },
        responses: {
          "200": jsonBody(ref("Prediction"), "Intervals, warnings and contributions."),
          "404": error("No such fit in this workspace."),
          "409": error("The fit is not approved (or was retired)."),
          "422": error("Unknown or missing channel, negative amount, bad control or horizon."),
          ...commonErrors,
        },
      },
    },
    "/api/scenarios": {
      get: {
        tags: ["Scenarios"],
        summary: "List scenarios",
        parameters: [{ name: "fitId", in: "query", required: false, description: "Only scenarios on this fit", schema: { type: "string", format: "uuid" } }],
        responses: { "200": jsonBody({ type: "object", properties: { scenarios: { type: "array", items: ref("Scenario") } } }, "Newest first."), ...commonErrors },
      },
      post: {
        tags: ["Scenarios"],
        summary: "Start a scenario on an approved fit (planners)",
        description:
          "Default horizon: a quarter of a year in the fit's periods (13 weeks). Default starting allocation: the spend of the most recent horizon in the history; or `allocation`, or `startFrom` a saved version. No version yet: the first save is version 1.",
        requestBody: {
          required: true,
          ...jsonBody({
            type: "object",
            required: ["fitId", "name"],
            properties: {
              fitId: { type: "string", format: "uuid" },
              name: { type: "string", maxLength: 200 },
              horizon: planProperties.horizon,
              controls: planProperties.controls,
              allocation: planProperties.allocation,
              startFrom: { type: "object", properties: { scenarioId: { type: "string", format: "uuid" }, version: { type: "integer" } } },
            },
          }),
        },
        responses: {
          "201": jsonBody(ref("Scenario"), "The scenario with its starting plan."),
          "404": error("No such fit in this workspace."),
          "409": error("The fit is not approved."),
          "422": error("Invalid name, horizon, controls or amounts."),
          ...commonErrors,
        },
      },
    },
    "/api/scenarios/{id}": {
      get: {
        tags: ["Scenarios"],
        summary: "A scenario with its starting plan and versions",
        parameters: [idParameter("scenario")],
        responses: { "200": jsonBody(ref("Scenario")), "404": error("No such scenario in this workspace."), ...commonErrors },
      },
    },
    "/api/scenarios/{id}/versions": {
      get: {
        tags: ["Scenarios"],
        summary: "The scenario's versions, oldest first",
        parameters: [idParameter("scenario")],
        responses: { "200": jsonBody({ type: "object", properties: { versions: { type: "array", items: { type: "object" } } } }), "404": error("No such scenario."), ...commonErrors },
      },
      post: {
        tags: ["Scenarios"],
        summary: "Save version baseVersion + 1 (planners)",
        description:
          "The server checks the plan, recomputes the prediction (client numbers are never stored) and inserts the next number in one transaction; of two saves on the same base exactly one succeeds. Warnings never block a save; they are stored with the version.",
        parameters: [idParameter("scenario")],
        requestBody: { required: true, ...jsonBody(ref("SaveVersionRequest")) },
        responses: {
          "201": jsonBody(ref("ScenarioVersion"), "The saved version."),
          "404": error("No such scenario in this workspace."),
          "409": error("A version after baseVersion exists (`details[0]` has latestVersion, savedBy, savedAt), or the fit is no longer approved. Nothing is stored."),
          "422": error("Amounts that do not add up to the fixed total (±0.01), negative or fractional-cent amounts, unknown channels, a total above the ceiling, a base version that does not exist. Nothing is stored."),
          ...commonErrors,
        },
      },
    },
    "/api/scenarios/{id}/versions/{n}": {
      get: {
        tags: ["Scenarios"],
        summary: "One version with its plan, prediction and warnings",
        parameters: [idParameter("scenario"), versionNumberParameter],
        responses: { "200": jsonBody(ref("ScenarioVersion")), "404": error("No such scenario or version."), ...commonErrors },
      },
    },
  },
};

// ---------------------------------------------------------------------------------------------
// Suggested split (issue 7)

const suggestions: Section = {
  tag: {
    name: "Suggested split",
    description:
      "The allocation an approved fit predicts does best for a plan, under its total, locks and bounds and inside the data the fit has seen. Nothing is saved: the planner saves a version. A fit of past spend is not proof that moving money causes the gain; test the shift on part of the budget first. Response curves are computed in the browser from the fit record (no route).",
  },
  schemas: {
    SuggestRequest: {
      type: "object",
      required: ["allocation", "horizon"],
      properties: {
        ...planProperties,
        level: { type: "number", exclusiveMinimum: 0.5, exclusiveMaximum: 1, description: "Confidence level of every interval; default the fit's (0.95)." },
        mode: { type: "string", enum: ["fixed", "growing"], default: "fixed", description: "fixed: spend exactly the total; growing: any total up to `ceiling` (less when more spend is not predicted to pay)." },
        total: { type: "number", minimum: 0, description: "Fixed mode: default the sum of `allocation`; when given it must equal that sum (±0.01)." },
        ceiling: { type: "number", minimum: 0, description: "Growing mode (required there): the most the plan may spend, at least the sum of `allocation`." },
        locks: { type: "array", items: { type: "string" }, description: "Channels held at their current amount." },
        floors: amounts("Per channel: the least it may get over the horizon."),
        ceilings: amounts("Per channel: the most it may get over the horizon."),
        keepInsideObservedRange: { type: "boolean", default: true, description: "Each channel within the spend per period the fit saw (× horizon)." },
        keepInsideHull: {
          type: "boolean",
          default: true,
          description: "Every period's leverage at most the largest in the history (no unseen combination). If no plan can meet it with the other rules, the answer says so (`hull.status: unreachable`).",
        },
      },
      example: {
        allocation: { search_eur: 260000, social_eur: 130000, video_eur: 143000, display_eur: 91000, podcast_eur: 65000, email_eur: 31200 },
        controls: { promo_week: 2 },
        horizon: 13,
        mode: "fixed",
        locks: ["email_eur"],
        floors: { podcast_eur: 40000 },
      },
    },
    Suggestion: {
      type: "object",
      required: ["allocation", "prediction", "current", "gain", "binding", "method", "notes", "caution"],
      properties: {
        fitId: { type: "string", format: "uuid" },
        allocation: amounts("Suggested spend per channel for the horizon (whole cents)."),
        total: { type: "number" },
        channels: {
          type: "array",
          items: {
            type: "object",
            properties: { name: { type: "string" }, label: { type: "string" }, amount: { type: "number" }, current: { type: "number" }, change: { type: "number" }, locked: { type: "boolean" } },
          },
        },
        prediction: { ...ref("Prediction"), description: "The suggested plan exactly as POST /predict answers it, with `difference` from the current plan." },
        current: interval("The current plan's horizon total."),
        gain: {
          type: "object",
          description: "Suggested minus current expected total, with the confidence interval of the difference (from the fit's covariance, not from the two intervals).",
          properties: { mean: { type: "number" }, confidence: { type: "array", items: { type: "number" }, minItems: 2, maxItems: 2 } },
        },
        level: { type: "number" },
        binding: {
          type: "array",
          description: "Constraints the suggestion stands against, in plain words.",
          items: {
            type: "object",
            required: ["kind", "message"],
            properties: {
              kind: { type: "string", enum: ["locked", "floor", "ceiling", "observed-min", "observed-max", "zero", "total-fixed", "total-ceiling", "hull"] },
              channel: { type: "string" },
              message: { type: "string" },
            },
          },
        },
        method: { type: "string", enum: ["exact", "local"], description: "exact: the best plan under the constraints; local: the best of several local searches (the problem is not concave), not guaranteed best." },
        starts: { type: ["integer", "null"], description: "For method local: how many starts." },
        solver: { type: "string", enum: ["linear-programme", "water-filling", "barrier", "multi-start-barrier", "none"] },
        converged: { type: "boolean" },
        hull: {
          type: "object",
          properties: { status: { type: "string", enum: ["kept", "off", "unreachable"] }, binding: { type: "boolean" }, leverage: { type: "number" }, maxTrainingLeverage: { type: "number" } },
        },
        notes: { type: "array", items: { type: "string" } },
        caution: { type: "string" },
      },
    },
  },
  paths: {
    "/api/fits/{id}/suggest": {
      post: {
        tags: ["Suggested split"],
        summary: "Suggest the split of a plan's budget the fit predicts does best",
        description:
          "Roles with fit:predict (planners, analysts, reviewers). Linear fits are solved exactly (a linear programme; a convex solve when the hull binds); concave log terms by KKT water-filling; interactions by a multi-start local method, labelled `local`. Nothing is saved.",
        parameters: [idParameter("fit")],
        requestBody: { required: true, ...jsonBody(ref("SuggestRequest")) },
        responses: {
          "200": jsonBody(ref("Suggestion"), "The suggested allocation, its prediction, gain, binding constraints, method and caution."),
          "404": error("No such fit in this workspace."),
          "409": error("The fit is not approved (or was retired)."),
          "422": error("Invalid plan or rules, or no plan meets them (e.g. floors above the total, a total the channels cannot take inside their observed ranges); `details` name the field."),
          ...commonErrors,
        },
      },
    },
  },
};

// ---------------------------------------------------------------------------------------------
// Spend histories (datasets)

const datasetIdParameter = idParameter("spend history");
const uploadQueryParameters = [
  { name: "filename", in: "query", required: false, description: "The file's name, for a raw body (or the `X-Filename` header, URI-encoded). Default `upload.csv`.", schema: { type: "string" } },
  { name: "name", in: "query", required: false, description: "Display name (default: the file name without extension).", schema: { type: "string", maxLength: 200 } },
  { name: "options", in: "query", required: false, description: "Upload options as JSON (see `UploadOptions`), e.g. the roles to check them in one step.", schema: { type: "string" } },
  { name: "background", in: "query", required: false, description: "`1` to have the worker check and store even a small file (202 with a job).", schema: { type: "string", enum: ["1", "true"] } },
];

const datasets: Section = {
  tag: {
    name: "Spend histories",
    description:
      "Uploaded CSV histories (periods × spend per channel, controls, outcome); `dataset` in the API. Two steps: the upload stores the file when every row can be read (phase 1: header, ragged rows, UTF-8, size…), then the roles (outcome, spend, control, period, ignored, with units) are checked against the rows (numbers, negative spend, missing values, constant columns, enough rows) and the history becomes `ready` for fits. Roles may also come with the upload. Nothing is stored from a refused file: every problem is listed with its row and column.",
  },
  schemas: {
    DatasetColumn: {
      type: "object",
      description: "A column: its role and unit (null until chosen) and its profile over every stored row.",
      properties: {
        position: { type: "integer", description: "1-based column number." },
        name: { type: "string" },
        kind: { type: "string", enum: ["numeric", "period", "text"], description: "What phase 1 found: numbers only, dates only, or anything else." },
        role: { type: ["string", "null"], enum: ["outcome", "spend", "control", "period", "ignored", null] },
        unit: { type: ["string", "null"], description: "An ISO 4217 currency code for money, or a unit such as `orders`, `weeks`." },
        numericCount: { type: "integer" },
        textCount: { type: "integer", description: "Cells that are not numbers (and not missing)." },
        missingCount: { type: "integer", description: "Empty cells (and NA, null, …)." },
        min: nullableNumber,
        max: nullableNumber,
        mean: nullableNumber,
        std: { ...nullableNumber, description: "Sample standard deviation." },
        firstPeriod: { type: ["string", "null"], format: "date" },
        lastPeriod: { type: ["string", "null"], format: "date" },
        sample: { type: "array", items: { type: "string" }, maxItems: 5 },
      },
    },
    DatasetSummary: {
      type: "object",
      properties: {
        id: { type: "string", format: "uuid" },
        name: { type: "string" },
        originalFilename: { type: "string" },
        byteSize: { type: "integer" },
        sha256: { type: "string", pattern: "^[0-9a-f]{64}$", description: "Of the original file, byte for byte." },
        rowCount: { type: "integer" },
        columnCount: { type: "integer" },
        delimiter: { type: "string", enum: [",", ";", "\t"] },
        hasBom: { type: "boolean" },
        lineEnding: { type: "string", enum: ["lf", "crlf", "cr"] },
        status: { type: "string", enum: ["needs-roles", "ready"] },
        missingPolicy: { type: "string", enum: ["reject", "drop-incomplete-rows"] },
        droppedRowCount: { type: "integer", description: "Rows left out of fits by drop-incomplete-rows (they stay stored)." },
        dateOrder: { type: "string", enum: ["YMD", "DMY", "MDY"] },
        uploadedBy: { type: ["string", "null"] },
        uploadedAt: { type: "string", format: "date-time" },
        rolesAssignedBy: { type: ["string", "null"] },
        rolesAssignedAt: { type: ["string", "null"], format: "date-time" },
        links: {
          type: "object",
          properties: { self: { type: "string" }, rows: { type: "string" }, correlations: { type: "string" }, roles: { type: "string" }, file: { type: "string" }, export: { type: "string" }, page: { type: "string" } },
        },
      },
    },
    Dataset: {
      allOf: [
        ref("DatasetSummary"),
        {
          type: "object",
          properties: {
            columns: { type: "array", items: ref("DatasetColumn") },
            notes: {
              type: "array",
              description: "Facts that did not block the upload (blank lines skipped, incomplete rows dropped, same file uploaded before, periods not ascending).",
              items: { type: "object", properties: { kind: { type: "string" }, message: { type: "string" }, count: { type: "integer" } } },
            },
          },
        },
      ],
      example: {
        id: "5b0f3c1e-2a8d-4d7e-9a51-3f2b7e1c9d40",
        name: "Larkspur weekly history",
        originalFilename: "larkspur-weekly-history.csv",
        rowCount: 156,
        columnCount: 9,
        status: "needs-roles",
        sha256: "f8aa0045de0c29ee73b738d9453f144cdbf672afe243603139fbe9c70af2810f",
        columns: [{ position: 9, name: "sales_eur", kind: "numeric", role: null, unit: null, numericCount: 156, textCount: 0, missingCount: 0, min: 207158, max: 350695, mean: 274854.2, std: 27829.1 }],
      },
    },
    RoleAssignment: {
      type: "object",
      description: "Roles by column name (exact, else ignoring case); columns not named are ignored. Exactly one outcome, at least one spend, at most one period.",
      additionalProperties: {
        type: "object",
        required: ["role"],
        additionalProperties: false,
        properties: { role: { type: "string", enum: ["outcome", "spend", "control", "period", "ignored"] }, unit: { type: "string", maxLength: 32 } },
      },
      example: { week_start: { role: "period" }, sales_eur: { role: "outcome", unit: "EUR" }, search_eur: { role: "spend", unit: "EUR" }, promo_week: { role: "control", unit: "weeks" } },
    },
    UploadOptions: {
      type: "object",
      additionalProperties: false,
      properties: {
        roles: ref("RoleAssignment"),
        missingPolicy: { type: "string", enum: ["reject", "drop-incomplete-rows"], default: "reject", description: "Empty cells in used columns: reject (each reported), or leave those rows out of fits (counted)." },
        minRows: { type: "integer", minimum: 1, description: "Fewest usable rows; default terms + 2." },
        dateOrder: { type: "string", enum: ["YMD", "DMY", "MDY"], default: "YMD", description: "How to read dates such as 03/01/2024 (ISO dates always work)." },
      },
    },
    AssignRolesRequest: {
      type: "object",
      required: ["roles"],
      additionalProperties: false,
      properties: {
        roles: ref("RoleAssignment"),
        missingPolicy: { type: "string", enum: ["reject", "drop-incomplete-rows"] },
        minRows: { type: "integer", minimum: 1 },
        dateOrder: { type: "string", enum: ["YMD", "DMY", "MDY"] },
      },
    },
    UploadProblems: {
      allOf: [ref("Error")],
      description:
        "A refused file: `error` summarises (\"The file was not stored: 2 problems (non-numeric cell, negative spend).\"); each detail has `kind`, `message`, `path`, and where it applies `row` (1-based data row), `line` (file line), `column` (the column's name), `columnNumber`, `value`, `byteOffset`. The first 200 are listed; a last detail of kind `omitted` counts the rest.",
      example: {
        error: "The file was not stored: 1 problem (negative spend).",
        details: [{ kind: "negative-spend", path: "file", row: 7, line: 8, column: "search_eur", columnNumber: 2, value: "-40", message: "Row 7, column 2 “search_eur”: spend is negative (-40)." }],
      },
    },
    RowsPage: {
      type: "object",
      properties: {
        datasetId: { type: "string", format: "uuid" },
        total: { type: "integer" },
        offset: { type: "integer" },
        limit: { type: "integer" },
        columns: { type: "array", items: { type: "object", properties: { position: { type: "integer" }, name: { type: "string" }, kind: { type: "string" }, role: { type: ["string", "null"] } } } },
        rows: {
          type: "array",
          items: {
            type: "object",
            properties: {
              rowNumber: { type: "integer" },
              line: { type: "integer" },
              cells: { type: "array", items: { type: ["number", "string", "null"] }, description: "In column order: the number, else the text, null when empty." },
            },
          },
        },
      },
    },
    CorrelationMatrix: {
      type: "object",
      properties: {
        datasetId: { type: "string", format: "uuid" },
        n: { type: "integer", description: "Complete rows used (those a fit would use)." },
        columns: { type: "array", items: { type: "object", properties: { position: { type: "integer" }, name: { type: "string" }, role: { type: ["string", "null"] } } } },
        matrix: { type: "array", items: { type: "array", items: nullableNumber }, description: "Pearson correlations; null where a column does not vary." },
      },
    },
  },
  paths: {
    "/api/datasets": {
      get: {
        tags: ["Spend histories"],
        summary: "List spend histories",
        description: "Permission dataset:read. Newest upload first.",
        parameters: [
          { name: "limit", in: "query", required: false, schema: { type: "integer", minimum: 1, maximum: 500, default: 50 } },
          { name: "offset", in: "query", required: false, schema: { type: "integer", minimum: 0, default: 0 } },
        ],
        responses: {
          "200": jsonBody({ type: "object", properties: { datasets: { type: "array", items: ref("DatasetSummary") }, limit: { type: "integer" }, offset: { type: "integer" } } }, "The histories."),
          "422": error("Invalid limit or offset."),
          ...commonErrors,
        },
      },
      post: {
        tags: ["Spend histories"],
        summary: "Upload a spend history (CSV)",
        description:
          "Permission dataset:upload. Send the file either as **multipart/form-data** (field `file`; optional fields `name` and `options`, JSON, which must come *before* the file) or as the **raw body** with `Content-Type: text/csv` and `?filename=`. Both are streamed, never buffered whole; up to 200 MB. Comma, semicolon or tab; header row; optional UTF-8 BOM; quoted fields.\n\n" +
          "Files up to 5 MB are checked and stored in the request: **201** with the history (id, rowCount, every column's profile) or **422** with every problem. Larger files (or `?background=1`, or no Content-Length) are streamed into PostgreSQL staging while a `dataset.ingest` job in a worker checks and stores them: **202** with the job; poll `GET /api/jobs/{id}` until `succeeded` (`result.datasetId`) or `failed` (`error` carries the same problem details). Nothing of a refused or interrupted upload is stored.\n\n" +
          "Example: `curl -H 'Authorization: Bearer trib_…' -F 'options={\"missingPolicy\":\"reject\"}' -F file=@history.csv https://…/api/datasets`",
        parameters: uploadQueryParameters,
        requestBody: {
          required: true,
          content: {
            "multipart/form-data": {
              schema: {
                type: "object",
                required: ["file"],
                properties: {
                  name: { type: "string", maxLength: 200 },
                  options: { type: "string", description: "`UploadOptions` as JSON." },
                  file: { type: "string", format: "binary" },
                },
              },
              encoding: { file: { contentType: "text/csv" } },
            },
            "text/csv": { schema: { type: "string", format: "binary" } },
          },
        },
        responses: {
          "201": jsonBody(ref("Dataset"), "Stored (status `needs-roles`, or `ready` when roles came with it)."),
          "202": jsonBody(
            { type: "object", properties: { job: ref("Job"), upload: { type: "object", properties: { id: { type: "string", format: "uuid" }, receivedBytes: { type: "integer" } } } } },
            "Large file received; the worker checks and stores it: poll the job.",
          ),
          "413": jsonBody(ref("UploadProblems"), "Over the size limit (detail kind `file-too-large`)."),
          "422": jsonBody(ref("UploadProblems"), "The file has problems (each with row and column), malformed options or form, another content type, or the body ended before its Content-Length."),
          ...commonErrors,
        },
      },
    },
    "/api/datasets/{id}": {
      get: {
        tags: ["Spend histories"],
        summary: "A spend history with its columns",
        description: "Permission dataset:read. Also who uploaded it and chose its roles, and the fits built on it.",
        parameters: [datasetIdParameter],
        responses: {
          "200": jsonBody(
            { allOf: [ref("Dataset"), { type: "object", properties: { uploadedByName: { type: ["string", "null"] }, rolesAssignedByName: { type: ["string", "null"] }, fits: { type: "array", items: { type: "object" } } } }] },
            "The history.",
          ),
          "404": error("No such spend history in this workspace."),
          ...commonErrors,
        },
      },
    },
    "/api/datasets/{id}/roles": {
      put: {
        tags: ["Spend histories"],
        summary: "Choose the column roles",
        description: "Permission dataset:upload. Runs the role-dependent checks on the stored rows; all pass → `ready`. Refused: nothing changes.",
        parameters: [datasetIdParameter],
        requestBody: { required: true, ...jsonBody(ref("AssignRolesRequest")) },
        responses: {
          "200": jsonBody(ref("Dataset"), "Roles recorded; the history is ready for fits."),
          "404": error("No such spend history in this workspace."),
          "409": error("An approved fit uses this history: its roles are frozen."),
          "422": jsonBody(ref("UploadProblems"), "The roles do not fit the data (\"The roles were not saved: …\"), each problem with row and column."),
          ...commonErrors,
        },
      },
    },
    "/api/datasets/{id}/rows": {
      get: {
        tags: ["Spend histories"],
        summary: "A page of rows",
        description: "Permission dataset:read. Rows `offset + 1` to `offset + limit` in file order.",
        parameters: [
          datasetIdParameter,
          { name: "offset", in: "query", required: false, schema: { type: "integer", minimum: 0, default: 0 } },
          { name: "limit", in: "query", required: false, schema: { type: "integer", minimum: 1, maximum: 1000, default: 100 } },
        ],
        responses: { "200": jsonBody(ref("RowsPage"), "The rows."), "404": error("No such spend history in this workspace."), "422": error("Invalid offset or limit."), ...commonErrors },
      },
    },
    "/api/datasets/{id}/correlations": {
      get: {
        tags: ["Spend histories"],
        summary: "Correlations of the candidate predictors",
        description: "Permission dataset:read. Spend and control columns (every numeric column before roles), over the rows a fit would use.",
        parameters: [datasetIdParameter],
        responses: { "200": jsonBody(ref("CorrelationMatrix"), "The matrix."), "404": error("No such spend history in this workspace."), ...commonErrors },
      },
    },
    "/api/datasets/{id}/file": {
      get: {
        tags: ["Spend histories"],
        summary: "Download the original file",
        description: "Permission dataset:read. Byte for byte as uploaded; its sha256 in `Repr-Digest` and `X-Content-SHA256`.",
        parameters: [datasetIdParameter],
        responses: {
          "200": { description: "The file.", content: { "text/csv": { schema: { type: "string", format: "binary" } } } },
          "404": error("No such spend history in this workspace."),
          ...commonErrors,
        },
      },
    },
    "/api/datasets/{id}/export": {
      get: {
        tags: ["Spend histories"],
        summary: "Export the rows as CSV",
        description:
          "Permission dataset:read. The stored rows with a header, in the file's delimiter. Text cells that a spreadsheet would run as a formula (starting with `=`, `+`, `-`, `@`, tab or CR) get a leading `'`; numbers, negative ones included, stay numbers.",
        parameters: [datasetIdParameter],
        responses: {
          "200": { description: "The rows as CSV.", content: { "text/csv": { schema: { type: "string" } } } },
          "404": error("No such spend history in this workspace."),
          ...commonErrors,
        },
      },
    },
  },
};

/** Areas in the order the documentation lists them; add yours here. */
// ---------------------------------------------------------------------------------------------
// Side by side and finance review (issue 6)

const versionParameters = [idParameter("scenario"), versionNumberParameter];
const shareRequest = {
  type: "object",
  required: ["recipients"],
  properties: {
    recipients: { type: "array", minItems: 1, items: { type: "string" }, description: "Finance members of the workspace, by user id or e-mail address." },
    note: { type: "string", maxLength: 2000 },
    acknowledgement: {
      type: ["string", "null"],
      maxLength: 2000,
      description: "Required when a shared version carries extrapolation warnings (422 without it): the planner's words that the numbers there are guesses.",
    },
  },
  example: { recipients: ["finance@larkspur.example"], note: "Please look before Friday." },
};

const review: Section = {
  tag: {
    name: "Side by side",
    description:
      "Comparisons of 2–4 scenario versions, finance review (comments, sign-off bound to one version), sharing with finance members, notifications and exports. A version's difference from the baseline has its own interval from the fit's covariance when both are on one fit; across fits no joint interval exists. Every number is an association from past data; the intervals assume the fitted model still describes the market; test large shifts on part of the budget first.",
  },
  schemas: {
    VersionRef: { type: "object", required: ["scenarioId", "version"], properties: { scenarioId: { type: "string", format: "uuid" }, version: { type: "integer", minimum: 1 } } },
    Signoff: {
      type: "object",
      description: "One finance decision on exactly one version (UI: Signed off · Declined (with reason)).",
      properties: {
        id: { type: "string", format: "uuid" },
        scenarioId: { type: "string", format: "uuid" },
        version: { type: "integer" },
        decision: { type: "string", enum: ["signed_off", "declined"] },
        reason: { type: "string" },
        decidedById: { type: ["string", "null"] },
        decidedByName: { type: ["string", "null"] },
        decidedAt: { type: "string", format: "date-time" },
      },
    },
    Comparison: {
      type: "object",
      properties: {
        id: { type: ["string", "null"], format: "uuid" },
        name: { type: ["string", "null"] },
        baselinePosition: { type: "integer", description: "Column (0-based) the differences are measured from." },
        oneFit: { type: "boolean" },
        channels: { type: "array", items: { type: "object", properties: { name: { type: "string" }, label: { type: "string" } } } },
        columns: {
          type: "array",
          items: {
            type: "object",
            properties: {
              position: { type: "integer" },
              scenarioId: { type: "string", format: "uuid" },
              scenarioName: { type: "string" },
              version: { type: "integer" },
              latestVersion: { type: "integer" },
              allocation: { type: "object", additionalProperties: { type: "number" }, description: "Channel → amount over the horizon." },
              totalSpend: { type: "number" },
              horizon: { type: "integer" },
              outcome: { type: "object", description: "The saved prediction of the horizon total: `mean`, `confidence` [low, high], `prediction` [low, high]." },
              level: { type: "number" },
              warnings: { type: "array", items: ref("ScenarioWarning") },
              fit: { type: "object", properties: { id: { type: "string" }, name: { type: "string" }, status: { type: "string" }, approvedByName: { type: ["string", "null"] }, approvedAt: { type: ["string", "null"] } } },
              difference: {
                type: "object",
                description: "`baseline`; `joint`: mean and `confidence` [low, high] of this expected total minus the baseline's, from the fit's covariance; `none`: the fits differ, `reason` says so.",
                properties: { kind: { type: "string", enum: ["baseline", "joint", "none"] }, mean: { type: "number" }, confidence: { type: "array", items: { type: "number" } }, reason: { type: "string" } },
              },
              signoff: { oneOf: [ref("Signoff"), { type: "null" }], description: "The version's latest decision; null: not signed off." },
            },
          },
        },
      },
    },
    Comment: {
      type: "object",
      properties: {
        id: { type: "string", format: "uuid" },
        scenarioId: { type: "string", format: "uuid" },
        version: { type: "integer" },
        parentId: { type: ["string", "null"], format: "uuid" },
        comparisonId: { type: ["string", "null"], format: "uuid" },
        authorName: { type: ["string", "null"] },
        body: { type: "string" },
        mentions: { type: "array", items: { type: "object", properties: { userId: { type: "string" }, name: { type: ["string", "null"] }, email: { type: "string" } } } },
        createdAt: { type: "string", format: "date-time" },
      },
    },
    Share: {
      type: "object",
      properties: {
        id: { type: "string", format: "uuid" },
        objectType: { type: "string", enum: ["scenario", "comparison"] },
        link: { type: "string" },
        recipients: { type: "array", items: { type: "object" } },
        acknowledgement: { type: ["string", "null"] },
        mailedTo: { type: "array", items: { type: "string" } },
      },
    },
    Notification: {
      type: "object",
      properties: {
        id: { type: "string", format: "uuid" },
        kind: { type: "string", enum: ["share", "mention", "reply", "comment", "signoff", "decline"] },
        title: { type: "string" },
        link: { type: "string", description: "A path inside the app." },
        actorName: { type: ["string", "null"] },
        createdAt: { type: "string", format: "date-time" },
        readAt: { type: ["string", "null"], format: "date-time" },
      },
    },
  },
  paths: {
    "/api/comparisons": {
      get: {
        tags: ["Side by side"],
        summary: "Saved comparisons of the workspace, newest first",
        responses: { "200": jsonBody({ type: "object", properties: { comparisons: { type: "array", items: { type: "object" } } } }), ...commonErrors },
      },
      post: {
        tags: ["Side by side"],
        summary: "Save a named comparison of 2–4 versions (planners, finance)",
        requestBody: {
          required: true,
          ...jsonBody({
            type: "object",
            required: ["name", "versions"],
            properties: { name: { type: "string", maxLength: 200 }, versions: { type: "array", minItems: 2, maxItems: 4, items: ref("VersionRef") }, baseline: { type: "integer", minimum: 0, maximum: 3, default: 0 } },
          }),
        },
        responses: {
          "201": jsonBody(ref("Comparison"), "The saved comparison, computed."),
          "404": error("A scenario of another workspace, or a version that does not exist."),
          "422": error("Fewer than 2 or more than 4 versions, a version twice, a baseline outside them."),
          ...commonErrors,
        },
      },
    },
    "/api/comparisons/{id}": {
      get: {
        tags: ["Side by side"],
        summary: "A saved comparison, computed now",
        parameters: [idParameter("comparison"), { name: "baseline", in: "query", required: false, description: "Another baseline column (0-based)", schema: { type: "integer", minimum: 0, maximum: 3 } }],
        responses: { "200": jsonBody(ref("Comparison")), "404": error("No such comparison in this workspace."), ...commonErrors },
      },
    },
    "/api/comparisons/{id}/export.csv": {
      get: {
        tags: ["Side by side"],
        summary: "The comparison as CSV, one row per version",
        description: "Numbers as numbers; text starting with = + - @ is prefixed with ' so spreadsheets never run it.",
        parameters: [idParameter("comparison")],
        responses: { "200": { description: "text/csv", content: { "text/csv": { schema: { type: "string" } } } }, "404": error("No such comparison in this workspace."), ...commonErrors },
      },
    },
    "/api/comparisons/{id}/export.pdf": {
      get: {
        tags: ["Side by side"],
        summary: "A one-page PDF for finance",
        description: "Each version's spend, predicted outcome with both intervals, difference from the baseline, warnings, the fit and who approved it, the sign-off, and the cautions.",
        parameters: [idParameter("comparison")],
        responses: { "200": { description: "application/pdf", content: { "application/pdf": { schema: { type: "string", format: "binary" } } } }, "404": error("No such comparison in this workspace."), ...commonErrors },
      },
    },
    "/api/comparisons/{id}/share": {
      post: {
        tags: ["Side by side"],
        summary: "Share a comparison with finance members (planners)",
        description: "Each recipient gets an e-mail with the link and a notification; the share is in the audit log.",
        parameters: [idParameter("comparison")],
        requestBody: { required: true, ...jsonBody(shareRequest) },
        responses: {
          "201": jsonBody(ref("Share")),
          "404": error("No such comparison in this workspace."),
          "422": error("A recipient who is not a finance member, or a warned version without an acknowledgement."),
          ...commonErrors,
        },
      },
    },
    "/api/scenarios/{id}/versions/{n}/comments": {
      get: {
        tags: ["Side by side"],
        summary: "Comments on one version, oldest first",
        parameters: versionParameters,
        responses: { "200": jsonBody({ type: "object", properties: { comments: { type: "array", items: ref("Comment") } } }), "404": error("No such scenario or version."), ...commonErrors },
      },
      post: {
        tags: ["Side by side"],
        summary: "Comment on one version (planners, finance)",
        description: "`@Full Name` or `@e-mail` mentions a member, who is e-mailed. Replies carry `parentId` (a comment on the same version).",
        parameters: versionParameters,
        requestBody: {
          required: true,
          ...jsonBody({
            type: "object",
            required: ["body"],
            properties: { body: { type: "string", maxLength: 4000 }, parentId: { type: ["string", "null"], format: "uuid" }, comparisonId: { type: ["string", "null"], format: "uuid" } },
          }),
        },
        responses: { "201": jsonBody(ref("Comment")), "404": error("No such scenario or version."), "422": error("Empty, or a parent on another version."), ...commonErrors },
      },
    },
    "/api/scenarios/{id}/versions/{n}/signoff": {
      get: {
        tags: ["Side by side"],
        summary: "The version's sign-off status and decision history",
        parameters: versionParameters,
        responses: {
          "200": jsonBody({ type: "object", properties: { current: { oneOf: [ref("Signoff"), { type: "null" }] }, history: { type: "array", items: ref("Signoff") } } }, "current null: not signed off."),
          "404": error("No such scenario or version."),
          ...commonErrors,
        },
      },
      post: {
        tags: ["Side by side"],
        summary: "Sign off or decline exactly this version (finance)",
        parameters: versionParameters,
        requestBody: {
          required: true,
          ...jsonBody({ type: "object", required: ["decision"], properties: { decision: { type: "string", enum: ["signed_off", "declined"] }, reason: { type: ["string", "null"], description: "Required to decline." } } }),
        },
        responses: {
          "201": jsonBody(ref("Signoff")),
          "404": error("No such scenario or version."),
          "409": error("Signing off a version whose fit is no longer approved."),
          "422": error("A decline without a reason."),
          ...commonErrors,
        },
      },
    },
    "/api/scenarios/{id}/versions/{n}/share": {
      post: {
        tags: ["Side by side"],
        summary: "Share one version with finance members (planners)",
        parameters: versionParameters,
        requestBody: { required: true, ...jsonBody(shareRequest) },
        responses: {
          "201": jsonBody(ref("Share")),
          "404": error("No such scenario or version."),
          "422": error("A recipient who is not a finance member, or a warned version without an acknowledgement."),
          ...commonErrors,
        },
      },
    },
    "/api/notifications": {
      get: {
        tags: ["Side by side"],
        summary: "The caller's notifications in this workspace, with the unread count",
        parameters: [
          { name: "unread", in: "query", required: false, description: "1: only unread", schema: { type: "string", enum: ["0", "1", "true", "false"] } },
          { name: "limit", in: "query", required: false, description: "How many to return (default 100); 0: only the unread count", schema: { type: "integer", minimum: 0, maximum: 500 } },
        ],
        responses: { "200": jsonBody({ type: "object", properties: { unread: { type: "integer" }, notifications: { type: "array", items: ref("Notification") } } }), ...commonErrors },
      },
    },
    "/api/notifications/read": {
      post: {
        tags: ["Side by side"],
        summary: "Mark the caller's notifications read (ids, or all)",
        requestBody: { required: true, ...jsonBody({ type: "object", properties: { ids: { type: "array", items: { type: "string", format: "uuid" } }, all: { type: "boolean" } } }) },
        responses: { "200": jsonBody({ type: "object", properties: { marked: { type: "integer" }, unread: { type: "integer" } } }), "422": error("Neither ids nor all."), ...commonErrors },
      },
    },
  },
};

const sections: Section[] = [datasets, fits, scenarios, suggestions, review, jobs];

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
