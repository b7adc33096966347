import { rmSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  Client,
  DEMO_PASSWORD,
  ensureBuild,
  pinBody,
  startServer,
  syntheticPickCsv,
  tempDataDir,
  viewpointBody,
  waitForAnalysis,
  type RunningServer,
} from "../../scripts/hardening/server";
import { openStopped, pickSetIntegrity } from "./inspect-db";

/**
 * SIGKILL the real production server (a) while a 10⁵-pick upload is in flight and an acknowledged one is being analysed,
 * (b) in the middle of a burst of writes; restart on the same data folder each time. Checks: the database opens, no
 * pick set is visible without its analysis row or with truncated picks, every acknowledged write is there, and the
 * interrupted analysis is resumed and can be re-run to done.
 */
type Fault = { id: string; name: string };

let server: RunningServer | null = null;
const dataDir = tempDataDir("crash");

async function signedIn(url: string, who = "interpreter@quillon.test") {
  const client = new Client(url);
  await client.signIn(who, DEMO_PASSWORD);
  return client;
}

async function demoFaults(client: Client): Promise<Fault[]> {
  const { studies } = (await (await client.request("/api/studies")).json()) as { studies: { id: string }[] };
  const { faults } = (await (await client.request(`/api/studies/${studies[0].id}/faults`)).json()) as { faults: Fault[] };
  return faults;
}

async function checkStoredIntegrity() {
  const client = await openStopped(dataDir);
  try {
    const sets = await pickSetIntegrity(client);
    for (const set of sets) {
      expect(set.analyses, `pick set ${set.id} has an analysis row`).toBeGreaterThan(0);
      expect(set.decodedPicks, `pick set ${set.id} holds all ${set.rowCount} picks`).toBe(set.rowCount);
    }
    return sets;
  } finally {
    await client.close();
  }
}

beforeAll(async () => {
  ensureBuild();
  server = await startServer({ dataDir });
});
afterAll(async () => {
  await server?.stop();
  rmSync(dataDir, { recursive: true, force: true });
});

describe("killing the server (SIGKILL) and starting it again on the same data folder", () => {
  const acknowledged = { pins: [] as string[], viewpoints: [] as string[], faults: [] as string[] };
  let inFlightLanded = false;

  it("in the middle of an upload and an analysis of 10⁵ picks: nothing half-written, the analysis resumes and re-runs to done", async () => {
    const client = await signedIn(server!.url);
    const [fault] = await demoFaults(client);
    await waitForAnalysis(client, fault.id);
    const first = await syntheticPickCsv(100_000, 11);
    const second = await syntheticPickCsv(100_000, 12);

    const accepted = await client.upload(fault.id, "big-1.csv", first.csv);
    expect(accepted.status).toBe(201);
    const { pickSetId, analysisId } = (await accepted.json()) as { pickSetId: string; analysisId: string };
    // a second upload is on the wire when the process dies: it must land whole (pick set + analysis) or not at all
    const inFlight = client.upload(fault.id, "big-2.csv", second.csv).catch((error: Error) => error);
    for (let polls = 0; polls < 200; polls++) {
      const { analysis } = (await (await client.request(`/api/faults/${fault.id}/analysis?pickSet=${pickSetId}`)).json()) as { analysis: { status: string } };
      if (analysis.status === "running") break;
      await new Promise((resolve) => setTimeout(resolve, 25));
    }
    await server!.kill9();
    const lost = await inFlight;
    expect(lost instanceof Error || lost.status === 201).toBe(true);

    await checkStoredIntegrity();
    server = await startServer({ dataDir });
    const again = await signedIn(server.url);
    const { pickSets } = (await (await again.request(`/api/faults/${fault.id}/pick-sets`)).json()) as {
      pickSets: { id: string; fileName: string; rowCount: number }[];
    };
    const big = pickSets.filter((set) => set.fileName.startsWith("big-"));
    expect(big.map((set) => set.fileName)).toContain("big-1.csv");
    const expectedRows: Record<string, number> = { "big-1.csv": first.rows, "big-2.csv": second.rows };
    for (const set of big) expect(set.rowCount, set.fileName).toBe(expectedRows[set.fileName]);
    inFlightLanded = big.some((set) => set.fileName === "big-2.csv");

    // the analysis interrupted by the kill is queued again at start-up and completes
    const resumed = await waitForAnalysis(again, fault.id);
    expect(resumed.status).toBe("done");
    const first1 = (await (await again.request(`/api/faults/${fault.id}/analysis?pickSet=${pickSetId}`)).json()) as {
      analysis: { id: string; status: string };
    };
    expect(first1.analysis.id).toBe(analysisId);
    expect(first1.analysis.status).toBe("done");
    // and the user can re-run it explicitly
    const rerun = await again.json(`/api/faults/${fault.id}/analysis/rerun`, "POST", { pickSetId });
    expect(rerun.status).toBe(202);
    const rerunResult = await waitForAnalysis(again, fault.id);
    expect(rerunResult.status).toBe("done");
    console.log(
      `crash: SIGKILL during a running analysis of ${first.rows} picks with a second upload in flight (${inFlightLanded ? "landed whole" : "not stored"}); after restart every pick set has its analysis row and all its picks, the analysis resumed to done and a re-run completed`,
    );
  });

  it("in the middle of a burst of writes: every acknowledged pin, viewpoint and fault is there after the restart", async () => {
    const writers = await Promise.all(["owner@quillon.test", "interpreter@quillon.test", "reviewer@quillon.test"].map((who) => signedIn(server!.url, who)));
    const faults = await demoFaults(writers[0]);
    const { studies } = (await (await writers[0].request("/api/studies")).json()) as { studies: { id: string }[] };
    const target = faults[0];
    const { analysis } = (await (await writers[0].request(`/api/faults/${target.id}/analysis`)).json()) as {
      analysis: { result: { segments: { id: string }[] } };
    };
    const segmentId = analysis.result.segments[0].id;

    let sequence = 0;
    let stop = false;
    const loop = async (client: Client, slot: number) => {
      while (!stop) {
        const index = sequence++;
        try {
          const kind = index % 3;
          if (kind === 0 && index < 90) {
            const response = await client.json(`/api/faults/${target.id}/pins`, "POST", pinBody(segmentId, index));
            if (response.status === 201) acknowledged.pins.push(((await response.json()) as { pin: { id: string } }).pin.id);
          } else if (kind === 1 || kind === 0) {
            const response = await client.json(`/api/faults/${target.id}/viewpoints`, "POST", viewpointBody(index));
            if (response.status === 201) acknowledged.viewpoints.push(((await response.json()) as { viewpoint: { id: string } }).viewpoint.id);
          } else {
            const response = await client.json(`/api/studies/${studies[0].id}/faults`, "POST", { name: `Burst ${slot}-${index}` });
            if (response.status === 201) acknowledged.faults.push(((await response.json()) as { fault: { id: string } }).fault.id);
          }
        } catch {
          return; // the connection died with the server: that write was never acknowledged
        }
      }
    };
    const loops = Array.from({ length: 12 }, (_, slot) => loop(writers[slot % writers.length], slot));
    while (acknowledged.pins.length + acknowledged.viewpoints.length + acknowledged.faults.length < 60) await new Promise((resolve) => setTimeout(resolve, 20));
    await server!.kill9();
    stop = true;
    await Promise.all(loops);
    expect(acknowledged.pins.length).toBeGreaterThan(0);
    expect(acknowledged.viewpoints.length).toBeGreaterThan(0);
    expect(acknowledged.faults.length).toBeGreaterThan(0);

    const sets = await checkStoredIntegrity();
    expect(sets.length).toBeGreaterThanOrEqual(3);
    server = await startServer({ dataDir });
    const reader = await signedIn(server.url, "owner@quillon.test");
    const pinList = (await (await reader.request(`/api/faults/${target.id}/pins`)).json()) as { pins: { id: string }[] };
    const pinIds = new Set(pinList.pins.map((pin) => pin.id));
    expect(acknowledged.pins.filter((id) => !pinIds.has(id))).toEqual([]);
    const viewpointList = (await (await reader.request(`/api/faults/${target.id}/viewpoints`)).json()) as { viewpoints: { id: string }[] };
    const viewpointIds = new Set(viewpointList.viewpoints.map((viewpoint) => viewpoint.id));
    expect(acknowledged.viewpoints.filter((id) => !viewpointIds.has(id))).toEqual([]);
    const faultList = new Set((await demoFaults(reader)).map((fault) => fault.id));
    expect(acknowledged.faults.filter((id) => !faultList.has(id))).toEqual([]);
    console.log(
      `crash: after SIGKILL mid-burst, ${acknowledged.pins.length} pins, ${acknowledged.viewpoints.length} viewpoints, ${acknowledged.faults.length} faults acknowledged — all present after restart; ${sets.length} pick sets, each with its analysis row and all picks`,
    );
  });
});
