import { z } from 'zod'

export const deliveryQuerySchema = z.strictObject({
  status: z.enum(['pending', 'sending', 'sent', 'failed', 'cancelled']).optional(),
  kind: z.enum(['invitation', 'password_reset', 'weekly_status']).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
})
export type DeliveryQuery = z.infer<typeof deliveryQuerySchema>
