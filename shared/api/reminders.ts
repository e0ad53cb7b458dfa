import { z } from 'zod';

export const SERVICE_ITEMS = ['fuel_filter', 'in_tank_strainer', 'oil', 'spark_plug', 'other'] as const;
export const ServiceItemSchema = z.enum(SERVICE_ITEMS);

export const REMINDER_STATUSES = ['pending', 'sent', 'dismissed', 'done'] as const;
export const ReminderStatusSchema = z.enum(REMINDER_STATUSES);

export const MAIL_STATUSES = ['queued', 'sent', 'failed'] as const;
export const MailStatusSchema = z.enum(MAIL_STATUSES);
export type ServiceItem = z.infer<typeof ServiceItemSchema>;
