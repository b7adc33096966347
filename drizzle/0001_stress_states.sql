CREATE TABLE "stress_states" (
	"id" text PRIMARY KEY NOT NULL,
	"study_id" text NOT NULL,
	"fault_id" text,
	"version" integer NOT NULL,
	"parameters" jsonb NOT NULL,
	"source" text DEFAULT '' NOT NULL,
	"set_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "stress_states" ADD CONSTRAINT "stress_states_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stress_states" ADD CONSTRAINT "stress_states_fault_id_faults_id_fk" FOREIGN KEY ("fault_id") REFERENCES "public"."faults"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stress_states" ADD CONSTRAINT "stress_states_set_by_users_id_fk" FOREIGN KEY ("set_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "stress_states_scope_idx" ON "stress_states" USING btree ("study_id","fault_id","version");