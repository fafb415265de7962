import { getDb } from "@/db";
import { organisations, projectMembers, projects, stations, type ProjectRole } from "@/db/schema";
import { getAuth } from "@/lib/auth";
import { createUserWithPassword } from "@/lib/users";

export const PASSWORD = "correct-horse-battery";

/** Signs a user in through better-auth's HTTP handler and returns the Cookie header to send. */
export async function signIn(email: string, password = PASSWORD): Promise<string> {
  const res = await getAuth().handler(
    new Request("http://localhost:3000/api/auth/sign-in/email", {
      method: "POST",
      headers: { "content-type": "application/json", origin: "http://localhost:3000" },
      body: JSON.stringify({ email, password }),
    }),
  );
  if (res.status !== 200) throw new Error(`sign-in failed for ${email}: ${res.status} ${await res.text()}`);
  const cookies = res.headers.getSetCookie().map((c) => c.split(";")[0]);
  return cookies.join("; ");
}

export interface World {
  projectId: string;
  otherProjectId: string;
  stationId: string;
  cookies: Record<ProjectRole | "admin" | "outsider", string>;
  userIds: Record<ProjectRole | "admin" | "outsider", string>;
}

let counter = 0;

/** A project with one user per role, an admin, an outsider (member of another project only) and a station. */
export async function makeWorld(): Promise<World> {
  const db = getDb();
  const n = ++counter;
  const [org] = await db.insert(organisations).values({ name: `Test org ${n}` }).returning();
  const [project] = await db.insert(projects).values({ organisationId: org.id, code: `TP${n}`, name: `Test project ${n}` }).returning();
  const [other] = await db.insert(projects).values({ organisationId: org.id, code: `OT${n}`, name: `Other project ${n}` }).returning();
  const [station] = await db.insert(stations).values({ projectId: project.id, code: `TP${n}-ST-001`, lat: 37.7, lon: -6.6 }).returning();
  const roles: ProjectRole[] = ["lead", "field_geologist", "lab_analyst", "consultant"];
  const cookies = {} as World["cookies"];
  const userIds = {} as World["userIds"];
  for (const who of [...roles, "admin", "outsider"] as const) {
    const email = `${who}.${n}@example.test`;
    const u = await createUserWithPassword({ email, name: `${who} ${n}`, password: PASSWORD, siteRole: who === "admin" ? "admin" : "user" });
    userIds[who] = u.id;
    if ((roles as string[]).includes(who)) await db.insert(projectMembers).values({ projectId: project.id, userId: u.id, role: who as ProjectRole });
    if (who === "outsider") await db.insert(projectMembers).values({ projectId: other.id, userId: u.id, role: "lead" });
    cookies[who] = await signIn(email);
  }
  return { projectId: project.id, otherProjectId: other.id, stationId: station.id, cookies, userIds };
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Handler = (req: Request, ctx: { params: Promise<any> }) => Promise<Response>;

/** Calls a route handler in-process like Next would. */
export async function call(
  handler: Handler,
  opts: { method?: string; path?: string; params?: Record<string, string>; cookie?: string; body?: unknown; rawBody?: BodyInit; headers?: Record<string, string> },
) {
  const headers = new Headers(opts.headers);
  if (opts.cookie) headers.set("cookie", opts.cookie);
  let body: BodyInit | undefined = opts.rawBody;
  if (opts.body !== undefined) {
    headers.set("content-type", "application/json");
    body = JSON.stringify(opts.body);
  }
  const req = new Request(`http://localhost:3000${opts.path ?? "/"}`, { method: opts.method ?? "GET", headers, body });
  const res = await handler(req, { params: Promise.resolve(opts.params ?? {}) });
  const text = await res.text();
  let json: unknown = null;
  try {
    json = text ? JSON.parse(text) : null;
  } catch {
    json = text;
  }
  return { status: res.status, json: json as any, headers: res.headers }; // eslint-disable-line @typescript-eslint/no-explicit-any
}
