import { z } from "zod";

const supportedCurrencies = new Set(Intl.supportedValuesOf("currency"));

export const currencySchema = z
  .string()
  .trim()
  .toUpperCase()
  .refine((code) => supportedCurrencies.has(code), "Use a three-letter ISO 4217 currency code, e.g. EUR.");

export const localeSchema = z
  .string()
  .trim()
  .refine((tag) => {
    try {
      return Intl.NumberFormat.supportedLocalesOf([tag]).length === 1;
    } catch {
      return false;
    }
  }, "Use a locale tag such as en-IE or de-DE.");

export const updateWorkspaceRequestSchema = z
  .object({
    name: z.string().trim().min(1, "The name cannot be empty.").max(100).optional(),
    currency: currencySchema.optional(),
    locale: localeSchema.optional(),
  })
  .strict();
export type UpdateWorkspaceRequest = z.input<typeof updateWorkspaceRequestSchema>;
