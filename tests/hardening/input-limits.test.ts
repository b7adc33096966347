import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { faults, studies } from "@/db/schema";
import * as studiesRoute from "@/app/api/studies/route";
import * as faultRoute from "@/app/api/faults/[faultId]/route";
import * as membersRoute from "@/app/api/studies/[studyId]/members/route";
import * as pickSetsRoute from "@/app/api/faults/[faultId]/pick-sets/route";
import { ApiError } from "@/lib/api/errors";
import { readJson } from "@/lib/api/handler";
import { readUploadedFile } from "@/lib/api/multipart";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

/** A body of `total` bytes produced on demand in 64 KB chunks; `pulled()` tells how much the server actually read. */
function lazyBody(total: number, prefix = "") {
  let sent = 0;
  const head = new TextEncoder().encode(prefix);
  const stream = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (sent >= total) return controller.close();
      const chunk = sent === 0 ? head : new Uint8Array(Math.min(65536, total - sent)).fill(0x31);
      sent += chunk.byteLength;
      controller.enqueue(chunk);
    },
  });
  return { stream, pulled: () => sent };
}

const streamingRequest = (body: ReadableStream<Uint8Array>, headers: Record<string, string>) =>
  new Request("http://localhost:3000/api/x", { method: "POST", body, headers: { host: "localhost:3000", ...headers }, duplex: "half" } as RequestInit);

async function rejection(promise: Promise<unknown>) {
  try {
    await promise;
  } catch (error) {
    return error;
  }
  throw new Error("expected a rejection");
}

describe("oversized bodies are refused before being read whole", () => {
  it("an upload whose Content-Length is over the limit is refused without reading a byte", async () => {
    const body = lazyBody(50 * 1048576);
    const error = await rejection(
      readUploadedFile(streamingRequest(body.stream, { "content-length": String(50 * 1048576), "content-type": "multipart/form-data; boundary=x" }), 1048576),
    );
    expect(error).toBeInstanceOf(ApiError);
    expect((error as ApiError).status).toBe(413);
    expect((error as ApiError).message).toMatch(/50\.0 MB; the limit is 1 MB/);
    expect(body.pulled()).toBeLessThan(256 * 1024);
  });

  it("an upload without Content-Length (chunked) is cut off once it passes the limit", async () => {
    const boundary = "----hardening";
    const body = lazyBody(50 * 1048576, `--${boundary}\r\ncontent-disposition: form-data; name="file"; filename="big.csv"\r\ncontent-type: text/csv\r\n\r\n`);
    const error = await rejection(readUploadedFile(streamingRequest(body.stream, { "content-type": `multipart/form-data; boundary=${boundary}` }), 1048576));
    expect(error).toBeInstanceOf(ApiError);
    expect((error as ApiError).status).toBe(413);
    expect(body.pulled()).toBeLessThan(4 * 1048576);
  });

  it("a JSON body over the limit is refused by Content-Length, and when streamed without one", async () => {
    const declared = lazyBody(5 * 1048576);
    const byHeader = await rejection(
      readJson(streamingRequest(declared.stream, { "content-length": String(5 * 1048576), "content-type": "application/json" })),
    );
    expect((byHeader as ApiError).status).toBe(413);
    expect(declared.pulled()).toBe(0);
    const chunked = lazyBody(5 * 1048576, '{"name":"');
    const byStream = await rejection(readJson(streamingRequest(chunked.stream, { "content-type": "application/json" })));
    expect((byStream as ApiError).status).toBe(413);
    expect(chunked.pulled()).toBeLessThan(2 * 1048576);
  });

  it("a JSON body that is not UTF-8, empty or not JSON gets a 400 naming the problem", async () => {
    const body = (bytes: BodyInit) => new Request("http://localhost:3000/api/x", { method: "POST", body: bytes, headers: { host: "localhost:3000" } });
    expect(((await rejection(readJson(body(new Blob([new Uint8Array([0xff, 0xfe, 0x00])]))))) as ApiError).message).toMatch(/UTF-8/);
    expect(((await rejection(readJson(body("")))) as ApiError).message).toMatch(/empty/);
    expect(((await rejection(readJson(body("{nope")))) as ApiError).message).toMatch(/not valid JSON/);
  });
});

describe("unknown JSON fields: ignored (zod drops them), never stored or acted on", () => {
  let fixture: Awaited<ReturnType<typeof studyWithEveryRole>>;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
  });

  it("POST /api/studies: an id, a creation time or an owner in the body change nothing", async () => {
    signInAs(fixture.people.viewer);
    const created = await callRoute(studiesRoute.POST, {
      method: "POST",
      body: { name: "Extra fields", id: "chosen-id", createdAt: "2000-01-01T00:00:00Z", ownerId: fixture.people.owner.id, role: "owner" },
    });
    expect(created.status).toBe(201);
    expect(created.json.study.id).not.toBe("chosen-id");
    const stored = await (await getDb()).query.studies.findFirst({ where: eq(studies.id, created.json.study.id) });
    expect(stored?.createdAt.getUTCFullYear()).toBeGreaterThan(2000);
  });

  it("PATCH /api/faults/[id]: a studyId in the body does not move the fault to another study", async () => {
    signInAs(fixture.people.owner);
    const patched = await callRoute(faultRoute.PATCH, {
      method: "PATCH",
      params: { faultId: fixture.fault.id },
      body: { description: "moved?", studyId: fixture.otherStudy.id },
    });
    expect(patched.status).toBe(200);
    const stored = await (await getDb()).query.faults.findFirst({ where: eq(faults.id, fixture.fault.id) });
    expect(stored?.studyId).toBe(fixture.study.id);
    expect(stored?.description).toBe("moved?");
  });

  it("POST members: an extra userId does not pick who is added; the role must still be valid", async () => {
    signInAs(fixture.people.owner);
    const bad = await callRoute(membersRoute.POST, {
      method: "POST",
      params: { studyId: fixture.study.id },
      body: { email: "new-person@example.test", role: "superuser", userId: fixture.people.outsider.id },
    });
    expect(bad.status).toBe(400);
    expect(bad.json.details.fieldErrors.role).toBeDefined();
  });

  it("pick-set form: unknown form fields are ignored, a bad known one is a 400 naming it", async () => {
    signInAs(fixture.people.interpreter);
    const form = new FormData();
    form.set("file", new File(["x,y,z,throw\n0,0,0,1\n100,0,-10,2\n0,100,-20,3\n100,100,-35,4\n"], "p.csv"));
    form.set("units", "furlongs");
    form.set("uploadedBy", fixture.people.owner.id);
    const response = await callRoute(pickSetsRoute.POST, {
      method: "POST",
      path: "/api/x?step=preview",
      params: { faultId: fixture.fault.id },
      formData: form,
    });
    expect(response.status).toBe(400);
    expect(Object.keys(response.json.details.fieldErrors)).toEqual(["units"]);
  });
});
