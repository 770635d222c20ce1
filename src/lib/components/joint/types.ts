/**
 * The joint as GET /api/joints/{id} returns it, for the joint card: the type the server's own
 * `joints.detail` gives, so a field added there reaches the card without a second copy.
 */
import type { detail } from '$lib/server/joints';

export type JointDetail = NonNullable<ReturnType<typeof detail>>;

export type InspectionRecord = JointDetail['inspections'][number];
