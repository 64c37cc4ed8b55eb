CREATE TABLE "embed_scripts" (
	"version" text PRIMARY KEY NOT NULL,
	"script" text NOT NULL,
	"integrity" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
