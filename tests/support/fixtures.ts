import { getDb } from "@/db/client";
import { faults, memberships, studies, users } from "@/db/schema";
import type { StudyRole } from "@/lib/contracts/roles";
import type { SessionUser } from "@/lib/auth/users";

const ROLES: StudyRole[] = ["owner", "interpreter", "reviewer", "viewer"];

/** A study with one member per role, an outsider who belongs to another study, and one fault in each study. */
export async function studyWithEveryRole(tag = Math.random().toString(36).slice(2, 8)) {
  const db = await getDb();
  const people = {} as Record<StudyRole | "outsider", SessionUser>;
  for (const who of [...ROLES, "outsider"] as const) {
    const [user] = await db
      .insert(users)
      .values({ email: `${who}-${tag}@example.test`, name: `${who} ${tag}`, passwordHash: "not-used-in-route-tests" })
      .returning({ id: users.id, email: users.email, name: users.name });
    people[who] = user;
  }
  const [study] = await db
    .insert(studies)
    .values({ name: `Study ${tag}` })
    .returning();
  const [otherStudy] = await db
    .insert(studies)
    .values({ name: `Other ${tag}` })
    .returning();
  for (const role of ROLES) await db.insert(memberships).values({ studyId: study.id, userId: people[role].id, role });
  await db.insert(memberships).values({ studyId: otherStudy.id, userId: people.outsider.id, role: "owner" });
  const [fault] = await db
    .insert(faults)
    .values({ studyId: study.id, name: `F-${tag}` })
    .returning();
  const [otherFault] = await db
    .insert(faults)
    .values({ studyId: otherStudy.id, name: `G-${tag}` })
    .returning();
  return { people, study, otherStudy, fault, otherFault };
}
