import { z } from "zod";

export const createTokenRequestSchema = z.object({
  name: z.string().trim().min(1, "Give the token a name, e.g. what script uses it.").max(100, "Use at most 100 characters."),
  /** ISO 8601 date or date-time; null or absent for a token that does not expire. */
  expiresAt: z.iso
    .datetime({ offset: true })
    .or(z.iso.date())
    .nullish()
    .transform((value) => (value ? new Date(value) : null)),
});
export type CreateTokenRequest = z.input<typeof createTokenRequestSchema>;
