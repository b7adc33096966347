CREATE TABLE "cutoff_sets" (
	"id" text PRIMARY KEY NOT NULL,
	"fault_id" text NOT NULL,
	"pick_set_id" text NOT NULL,
	"file_name" text NOT NULL,
	"checksum" text NOT NULL,
	"size_bytes" integer NOT NULL,
	"vertex_count" integer NOT NULL,
	"domain" text NOT NULL,
	"velocity_model" jsonb,
	"station_spacing_m" double precision NOT NULL,
	"rake_deg" double precision DEFAULT 90 NOT NULL,
	"vertices" "bytea" NOT NULL,
	"summary" jsonb NOT NULL,
	"uploaded_by" text,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "stratigraphy_tables" (
	"study_id" text PRIMARY KEY NOT NULL,
	"units" jsonb NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"updated_by" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "pick_sets" ADD COLUMN "velocity_model" jsonb;--> statement-breakpoint
ALTER TABLE "pick_sets" ADD COLUMN "derived_from" jsonb;--> statement-breakpoint
ALTER TABLE "cutoff_sets" ADD CONSTRAINT "cutoff_sets_fault_id_faults_id_fk" FOREIGN KEY ("fault_id") REFERENCES "public"."faults"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cutoff_sets" ADD CONSTRAINT "cutoff_sets_pick_set_id_pick_sets_id_fk" FOREIGN KEY ("pick_set_id") REFERENCES "public"."pick_sets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cutoff_sets" ADD CONSTRAINT "cutoff_sets_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stratigraphy_tables" ADD CONSTRAINT "stratigraphy_tables_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stratigraphy_tables" ADD CONSTRAINT "stratigraphy_tables_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "cutoff_sets_pick_set_idx" ON "cutoff_sets" USING btree ("pick_set_id");--> statement-breakpoint
CREATE INDEX "cutoff_sets_fault_idx" ON "cutoff_sets" USING btree ("fault_id");