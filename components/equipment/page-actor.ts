export { requirePageActor as pageActor, orNotFound } from "@/lib/auth/page-guard";
