ALTER TABLE "scans" ADD COLUMN "based_on_scan_id" integer;--> statement-breakpoint
ALTER TABLE "point_results" ADD COLUMN "point_key" text;--> statement-breakpoint
CREATE INDEX "point_results_scan_id_point_key_idx" ON "point_results" USING btree ("scan_id","point_key");