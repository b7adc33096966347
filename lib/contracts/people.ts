// People as the API shows them: an e-mail address as typed into a form, and a reference to a member by id and name.
import { z } from "zod";

export const emailSchema = z.string().trim().toLowerCase().email("Enter a valid e-mail address.").max(200);

export const personRefSchema = z.strictObject({ id: z.string(), name: z.string() });
export type PersonRef = z.infer<typeof personRefSchema>;
