// The roles in a study and what each may do: the one role matrix (docs/design.md "Roles"), used by the server's access
// checks (lib/access.ts), the database enum (db/schema.ts) and the screens that show or hide an action.
import { z } from "zod";

export const STUDY_ROLES = ["owner", "interpreter", "reviewer", "viewer"] as const;
export const studyRoleSchema = z.enum(STUDY_ROLES, { error: `The role must be one of ${STUDY_ROLES.join(", ")}.` });
export type StudyRole = z.infer<typeof studyRoleSchema>;

/** What a member may do in a study. */
export type StudyAction = "view" | "edit" | "comment" | "share" | "admin";

export const ROLE_PERMISSIONS: Record<StudyAction, readonly StudyRole[]> = {
  view: ["owner", "interpreter", "reviewer", "viewer"],
  edit: ["owner", "interpreter"],
  comment: ["owner", "interpreter", "reviewer"],
  share: ["owner", "interpreter", "reviewer"],
  admin: ["owner"],
};

export function roleAllows(role: StudyRole, action: StudyAction): boolean {
  return ROLE_PERMISSIONS[action].includes(role);
}

/** The kinds of fault a study holds (the faults.sense column). */
export const FAULT_SENSE_VALUES = ["normal", "reverse", "oblique"] as const;
export const faultSenseSchema = z.enum(FAULT_SENSE_VALUES, { error: `Choose the fault type: ${FAULT_SENSE_VALUES.join(" or ")}.` });
export type FaultSense = z.infer<typeof faultSenseSchema>;
