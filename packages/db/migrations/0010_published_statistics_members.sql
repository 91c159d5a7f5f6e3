CREATE TABLE "published_statistics_members" (
	"procedure_id" uuid NOT NULL,
	"peer_statistics_id" bigint NOT NULL,
	CONSTRAINT "published_statistics_members_procedure_id_peer_statistics_id_pk" PRIMARY KEY("procedure_id","peer_statistics_id")
);
--> statement-breakpoint
ALTER TABLE "published_statistics_members" ADD CONSTRAINT "published_statistics_members_peer_statistics_id_peer_statistics_id_fk" FOREIGN KEY ("peer_statistics_id") REFERENCES "public"."peer_statistics"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "published_statistics_members_peer_statistics_id_index" ON "published_statistics_members" USING btree ("peer_statistics_id");