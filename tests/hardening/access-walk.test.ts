import { readFileSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));

import type { StudyRole } from "@/lib/contracts/roles";
import { runAnalysis } from "@/lib/analysis/runner";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

/**
 * Walks every app/api/**\/route.ts found on disk (routes added later are picked up) and every HTTP method each exports:
 *   signed out → 401 (public routes excepted: health and auth; link-token routes → 404 for an unknown token);
 *   a member of another study, with ids from this study → 403/404, never a success (no IDOR);
 *   each role of the study → never a 500, and a viewer never succeeds with a mutation on study content.
 * A route with a path parameter this table does not know fails the walk: add its fixture below.
 */
const ROOT = path.resolve(__dirname, "../..");
const API = path.join(ROOT, "app/api");
const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;
const ROLES: StudyRole[] = ["owner", "interpreter", "reviewer", "viewer"];

function routeFiles(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const full = path.join(folder, name);
    if (statSync(full).isDirectory()) return routeFiles(full);
    return name === "route.ts" ? [full] : [];
  });
}

const routes = routeFiles(API)
  .map((file) => {
    const relative = path.relative(API, path.dirname(file)).split(path.sep).join("/");
    const params = [...relative.matchAll(/\[(?:\.\.\.)?(\w+)\]/g)].map((match) => match[1]);
    return { file, url: `/api/${relative}`, params };
  })
  .sort((a, b) => a.url.localeCompare(b.url));

const PUBLIC = new Set(["/api/health", "/api/auth/[...nextauth]"]);
const TOKEN_SCOPED = (url: string) => url.startsWith("/api/v/[token]");
// Routes with no study-scoped id: there is nothing of another study to ask for.
const NOT_STUDY_SCOPED = new Set(["/api/studies", "/api/digest"]);

/** A small analysable pick file: a plane dipping 60° E, throw peaking in the middle (common practice, no source). */
function smallPickCsv() {
  const lines = ["x,y,z,throw"];
  for (let i = 0; i < 6; i++)
    for (let j = 0; j < 6; j++) {
      const down = j * 100;
      lines.push(`${(down * 0.5).toFixed(3)},${i * 100},${(-down * Math.sin(Math.PI / 3)).toFixed(3)},${40 - Math.abs(i - 2.5) * 5 - Math.abs(j - 2.5) * 5}`);
    }
  return lines.join("\n");
}

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>> & { ids: Record<string, string> };

async function routeModule(url: string) {
  const route = routes.find((candidate) => candidate.url === url)!;
  return (await import(route.file)) as Record<string, (request: Request, context: { params: Promise<unknown> }) => Promise<Response>>;
}

/** A study with every role, an analysed pick set, a pin with a reply, a viewpoint with a link, via the routes themselves. */
async function populatedStudy(): Promise<Fixture> {
  const fixture = await studyWithEveryRole();
  const ids: Record<string, string> = { studyId: fixture.study.id, faultId: fixture.fault.id, userId: fixture.people.viewer.id, kind: "picks.csv" };
  signInAs(fixture.people.owner);
  const form = new FormData();
  form.set("file", new File([smallPickCsv()], "picks.csv", { type: "text/csv" }));
  const upload = await callRoute((await routeModule("/api/faults/[faultId]/pick-sets")).POST, {
    method: "POST",
    path: "/api/x?step=confirm",
    params: { faultId: fixture.fault.id },
    formData: form,
  });
  expect(upload.status, JSON.stringify(upload.json)).toBe(201);
  await runAnalysis(upload.json.analysisId);
  ids.pickSetId = upload.json.pickSetId;
  ids.analysisId = upload.json.analysisId;
  const analysis = await callRoute((await routeModule("/api/faults/[faultId]/analysis")).GET, { params: { faultId: fixture.fault.id } });
  const segmentId = analysis.json.analysis.result.segments[0].id;
  if (routes.some((route) => route.url === "/api/faults/[faultId]/pins")) {
    const pin = await callRoute((await routeModule("/api/faults/[faultId]/pins")).POST, {
      method: "POST",
      params: { faultId: fixture.fault.id },
      body: { x: 10, y: 20, z: -30, s: 5, t: 6, segmentId, body: "Walk pin" },
    });
    expect(pin.status, JSON.stringify(pin.json)).toBe(201);
    ids.pinId = pin.json.pin.id;
    const reply = await callRoute((await routeModule("/api/pins/[pinId]/replies")).POST, {
      method: "POST",
      params: { pinId: ids.pinId },
      body: { body: "Walk reply" },
    });
    expect(reply.status, JSON.stringify(reply.json)).toBe(201);
    ids.replyId = reply.json.reply.id;
  }
  if (routes.some((route) => route.url === "/api/faults/[faultId]/viewpoints")) {
    const viewpoint = await callRoute((await routeModule("/api/faults/[faultId]/viewpoints")).POST, {
      method: "POST",
      params: { faultId: fixture.fault.id },
      body: {
        title: "Walk view",
        camera: { position: [1, 2, 3], target: [0, 0, 0], up: [0, 0, 1], fov: 45 },
        settings: { layers: { surface: true }, colourMode: "throw", exaggeration: 1 },
      },
    });
    expect(viewpoint.status, JSON.stringify(viewpoint.json)).toBe(201);
    ids.viewpointId = viewpoint.json.viewpoint.id;
    const link = await callRoute((await routeModule("/api/viewpoints/[viewpointId]/links")).POST, {
      method: "POST",
      params: { viewpointId: ids.viewpointId },
      body: { expiresInDays: 7 },
    });
    expect(link.status, JSON.stringify(link.json)).toBe(201);
    ids.linkId = link.json.link.id;
  }
  // a well-formed token that was never issued: token-scoped routes must answer 404
  ids.token = "A".repeat(43);
  return { ...fixture, ids };
}

function paramsFor(route: (typeof routes)[number], fixture: Fixture) {
  const params: Record<string, string | string[]> = {};
  for (const name of route.params) {
    if (name === "nextauth") params[name] = ["session"];
    else if (fixture.ids[name] !== undefined) params[name] = fixture.ids[name];
    else throw new Error(`${route.url}: no fixture for the path parameter [${name}] — add one in tests/hardening/access-walk.test.ts`);
  }
  return params;
}

const call = async (route: (typeof routes)[number], method: string, fixture: Fixture) => {
  const routeExports = await routeModule(route.url);
  const body = method === "GET" || method === "DELETE" ? undefined : {};
  return callRoute(routeExports[method], {
    method,
    path: `${route.url}?analysis=${fixture.ids.analysisId}&pickSet=${fixture.ids.pickSetId}`,
    params: paramsFor(route, fixture),
    body,
  });
};

describe("access walk over every route handler on disk", () => {
  let shared: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    shared = await populatedStudy();
  }, 120_000);

  it("finds the route files", () => {
    expect(routes.length).toBeGreaterThan(10);
    console.log(`access walk: ${routes.length} route files, ${routes.map((route) => route.url).join(", ")}`);
  });

  for (const route of routes) {
    describe(route.url, () => {
      if (route.url === "/api/auth/[...nextauth]") {
        // next-auth's own handlers (sign-in, callback, session, CSRF token); they cannot load outside Next, and are
        // exercised over HTTP against the production server in tests/hardening/security.process.ts
        it("is next-auth's handler pair and nothing else", () => {
          const source = readFileSync(route.file, "utf8");
          expect(source).toMatch(/handlers/);
          expect(source).toMatch(/export const \{\s*GET,\s*POST\s*\}\s*=\s*handlers/);
        });
        return;
      }
      it("exports only known HTTP methods, each checked below", async () => {
        const routeExports = await routeModule(route.url);
        const exported = Object.keys(routeExports).filter((key) => /^[A-Z]+$/.test(key));
        expect(exported.length).toBeGreaterThan(0);
        for (const name of exported) expect(METHODS as readonly string[]).toContain(name);
      });

      for (const method of METHODS) {
        it(`${method}: signed out, another study's member, each role`, async () => {
          const routeExports = await routeModule(route.url);
          if (typeof routeExports[method] !== "function") {
            expect(routeExports[method]).toBeUndefined();
            return;
          }
          if (PUBLIC.has(route.url)) {
            // public by design: health answers everyone, the auth routes handle sign-in themselves
            signInAs(null);
            if (route.url === "/api/health") expect((await call(route, method, shared)).status).toBe(200);
            return;
          }
          const fixture = method === "DELETE" ? await populatedStudy() : shared;

          signInAs(null);
          const signedOut = await call(route, method, fixture);
          if (TOKEN_SCOPED(route.url)) {
            expect(signedOut.status, JSON.stringify(signedOut.json)).toBe(404);
            return;
          }
          expect(signedOut.status, JSON.stringify(signedOut.json)).toBe(401);

          if (!NOT_STUDY_SCOPED.has(route.url)) {
            signInAs(fixture.people.outsider);
            const outsider = await call(route, method, fixture);
            expect([403, 404], `${method} ${route.url} by a member of another study: ${outsider.status} ${JSON.stringify(outsider.json)}`).toContain(
              outsider.status,
            );
          }

          for (const role of method === "DELETE" ? [...ROLES].reverse() : ROLES) {
            signInAs(fixture.people[role]);
            const answer = await call(route, method, fixture);
            expect(answer.status, `${method} ${route.url} as ${role}: ${JSON.stringify(answer.json)}`).not.toBe(500);
            if (role === "viewer" && method !== "GET" && !NOT_STUDY_SCOPED.has(route.url) && !route.url.endsWith("/visit")) {
              expect(answer.status, `${method} ${route.url} as viewer`).toBeGreaterThanOrEqual(400);
            }
          }
        });
      }
    });
  }
});

// ---- server actions ------------------------------------------------------------------------------------------------

function serverActionFiles(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const full = path.join(folder, name);
    if (statSync(full).isDirectory()) return serverActionFiles(full);
    return /\.tsx?$/.test(name) && /^\s*["']use server["']/.test(readFileSync(full, "utf8")) ? [full] : [];
  });
}

const actionFiles = serverActionFiles(path.join(ROOT, "app")).map((file) => path.relative(ROOT, file).split(path.sep).join("/"));
// sign-in, sign-up and sign-out create or end the session: they are public by design (rate limit and password policy
// are tested in tests/hardening/security*.ts)
const PUBLIC_ACTION_FILES = new Set(["app/(auth)/actions.ts"]);

describe("access walk over every server action on disk", () => {
  beforeAll(async () => {
    await useFreshDatabase();
  });

  it("finds the server action files", () => {
    expect(actionFiles).toContain("app/(auth)/actions.ts");
    console.log(`access walk: server actions in ${actionFiles.join(", ")}`);
  });

  for (const file of actionFiles) {
    if (PUBLIC_ACTION_FILES.has(file)) continue;
    it(`${file}: every exported action refuses a signed-out caller`, async () => {
      const actionExports = (await import(path.join(ROOT, file))) as Record<string, unknown>;
      const actions = Object.entries(actionExports).filter(([, value]) => typeof value === "function") as [
        string,
        (state: unknown, form: FormData) => Promise<unknown>,
      ][];
      expect(actions.length).toBeGreaterThan(0);
      for (const [name, action] of actions) {
        signInAs(null);
        const form = new FormData();
        form.set("token", "A".repeat(43));
        form.set("notifyMode", "off");
        let outcome: unknown;
        try {
          outcome = await action({}, form);
        } catch (error) {
          // redirect() to the sign-in page is a refusal too
          const digest = String((error as { digest?: string }).digest ?? "");
          expect(digest, `${file} ${name}`).toMatch(/NEXT_REDIRECT.*\/sign-in/);
          continue;
        }
        const state = outcome as { ok?: boolean; message?: string };
        expect(state?.ok, `${file} ${name} signed out`).not.toBe(true);
        expect(state?.message, `${file} ${name} says why`).toBeTruthy();
      }
    });
  }
});
