ALTER TABLE "faults" ADD COLUMN "rake_deg" double precision;--> statement-breakpoint
ALTER TABLE "faults" ADD COLUMN "inversion" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "studies" ADD COLUMN "coordinate_reference" jsonb;