import { z } from "zod";

export const listNotificationsQuerySchema = z.object({
  unread: z.enum(["0", "1", "true", "false"]).optional(),
  /** How many notifications to return (default 100); 0 returns only the unread count (the header's poll). */
  limit: z.coerce.number().int("limit must be a whole number.").min(0).max(500).optional(),
});
