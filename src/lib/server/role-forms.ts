import { z } from 'zod';
import { platformRoles } from '$lib/roles';

export const roleChangeSchema = z.object({
	userId: z.uuid('Choose a person from the list.'),
	role: z.enum(platformRoles, { error: 'Choose trainer, inspector or registrar.' })
});
