// The 3D camera as data, in world coordinates (m, x East, y North, z Up), so a viewpoint can be saved and restored
// exactly whatever local origin the scene uses: stored in viewpoints.camera, sent by the workspace, read by the link page.
import { z } from "zod";

/** World coordinates are metres; a million kilometres is far outside any survey, so larger means a broken client. */
const coordinate = z.number().finite("Use a finite number.").min(-1e9).max(1e9);
const worldVector = z.tuple([coordinate, coordinate, coordinate]);

export const cameraSchema = z
  .object({
    position: worldVector,
    target: worldVector,
    up: worldVector.refine(([x, y, z]) => Math.hypot(x, y, z) > 1e-9, "The up vector must not be zero."),
    /** vertical field of view, degrees */
    fov: z.number().finite().min(1, "Field of view must be at least 1°.").max(150, "Field of view must be at most 150°."),
  })
  .refine(({ position, target }) => position.some((value, axis) => value !== target[axis]), {
    message: "The camera position and target must differ.",
    path: ["target"],
  });

export type CameraState = z.infer<typeof cameraSchema>;
