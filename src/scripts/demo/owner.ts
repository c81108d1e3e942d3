import { eq } from 'drizzle-orm';
import { db, schema } from '../../lib/server/db';

/** The demo clinician by address, as the owner the app's recording and segment calls take. */
export function demoOwner(clinicianEmail: string): { id: string; clinicId: string } {
	const store = db();
	const clinician = store.query.users
		.findFirst({ where: eq(schema.users.email, clinicianEmail) })
		.sync();
	const membership = clinician
		? store.query.memberships
				.findFirst({ where: eq(schema.memberships.userId, clinician.id) })
				.sync()
		: undefined;
	if (!clinician || !membership) throw new Error(`No demo clinician ${clinicianEmail}`);
	return { id: clinician.id, clinicId: membership.clinicId };
}
