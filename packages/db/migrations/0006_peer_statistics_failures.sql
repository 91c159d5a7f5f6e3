CREATE TABLE "peer_statistics_failures" (
	"peer_group_id" uuid NOT NULL,
	"level" integer NOT NULL,
	"period" text NOT NULL,
	"scope" text NOT NULL,
	"reason" text NOT NULL,
	"failed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "peer_statistics_failures_peer_group_id_level_period_scope_pk" PRIMARY KEY("peer_group_id","level","period","scope")
);
--> statement-breakpoint
ALTER TABLE "peer_statistics_failures" ADD CONSTRAINT "peer_statistics_failures_peer_group_id_peer_groups_id_fk" FOREIGN KEY ("peer_group_id") REFERENCES "public"."peer_groups"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "peer_statistics_failures_period_index" ON "peer_statistics_failures" USING btree ("period");