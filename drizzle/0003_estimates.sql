CREATE TYPE "public"."estimate_decided_via" AS ENUM('customer', 'owner_for_customer');--> statement-breakpoint
ALTER TABLE "estimates" ADD COLUMN "subtotal_cents" integer;--> statement-breakpoint
ALTER TABLE "estimates" ADD COLUMN "tax_cents" integer;--> statement-breakpoint
ALTER TABLE "estimates" ADD COLUMN "tax_rate_ppm" integer;--> statement-breakpoint
ALTER TABLE "estimates" ADD COLUMN "tax_rounding" "tax_rounding";--> statement-breakpoint
ALTER TABLE "estimates" ADD COLUMN "note" text;--> statement-breakpoint
ALTER TABLE "estimates" ADD COLUMN "decided_via" "estimate_decided_via";--> statement-breakpoint
ALTER TABLE "estimates" ADD COLUMN "decision_note" text;--> statement-breakpoint
ALTER TABLE "estimates" ADD COLUMN "created_by" integer;--> statement-breakpoint
ALTER TABLE "outbox" ADD COLUMN "estimate_id" integer;--> statement-breakpoint
ALTER TABLE "estimates" ADD CONSTRAINT "estimates_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outbox" ADD CONSTRAINT "outbox_estimate_id_estimates_id_fk" FOREIGN KEY ("estimate_id") REFERENCES "public"."estimates"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "estimates" ADD CONSTRAINT "estimates_decision_check" CHECK (("estimates"."status" in ('approved', 'declined')) = ("estimates"."decided_at" is not null));