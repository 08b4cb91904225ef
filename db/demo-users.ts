import type { Role } from "./schema";

export const DEMO_USERS: Array<{ email: string; name: string; role: Role }> = [
  { email: "technician@papin.example", name: "Tomás Reid", role: "technician" },
  { email: "engineer@papin.example", name: "Amara Osei", role: "engineer" },
  { email: "auditor@papin.example", name: "Helen Varga", role: "auditor" },
  { email: "admin@papin.example", name: "Sam Okafor", role: "admin" },
];
