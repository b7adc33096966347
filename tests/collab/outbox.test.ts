import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));

import { listOutbox } from "@/lib/outbox";
import { sendMail } from "@/lib/mail";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";

// basis: common practice, no source (a mailbox shows a person only the mail they are entitled to)
describe("the local outbox page's contents", () => {
  let fixture: Awaited<ReturnType<typeof studyWithEveryRole>>;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    const { people, study, otherStudy } = fixture;
    await sendMail({ to: people.interpreter.email, kind: "mention", studyId: study.id, subject: "this study's mention", text: "t" });
    await sendMail({ to: "someone@example.test", kind: "mention", studyId: otherStudy.id, subject: "other study's mention", text: "t" });
    await sendMail({ to: people.reviewer.email, kind: "digest", subject: "digest to the reviewer", text: "t" });
    await sendMail({ to: people.owner.email.toUpperCase(), kind: "digest", subject: "digest to the owner", text: "t" });
  });

  it("shows an owner their studies' e-mail and their own, never another study's or other people's digests", async () => {
    const ownerSees = (await listOutbox(fixture.people.owner)).map((message) => message.subject).sort();
    expect(ownerSees).toEqual(["digest to the owner", "this study's mention"]);
    const otherOwnerSees = (await listOutbox(fixture.people.outsider)).map((message) => message.subject);
    expect(otherOwnerSees).toEqual(["other study's mention"]);
  });
});
