import type { Role } from "./schema";

export const DEMO_USERS: Array<{ email: string; name: string; role: Role }> = [
  { email: "technician@papin.example", name: "Tomás Reid", role: "technician" },
  { email: "engineer@papin.example", name: "Amara Osei", role: "engineer" },
  // A qualification study needs three different engineers: author, reviewer and quality assurance (issue 14).
  { email: "reviewer@papin.example", name: "Priya Nair", role: "engineer" },
  { email: "qa@papin.example", name: "Jonas Weber", role: "engineer" },
  { email: "auditor@papin.example", name: "Helen Varga", role: "auditor" },
  { email: "admin@papin.example", name: "Sam Okafor", role: "admin" },
];
