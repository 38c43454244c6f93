/**
 * The invented demo scenario: a training provider's staff, an inspector and two
 * contractor companies with their crews. Pure data so that scripts can print it.
 * All addresses use the reserved `.test` top-level domain.
 */
export const DEMO_PASSWORD = 'patchwright-demo';

export interface DemoPerson {
	name: string;
	email: string;
	roles: ('trainer' | 'inspector' | 'registrar')[];
	company?: { name: string; role: 'admin' | 'member' };
	/** A trainer of their own company: works with that company's crew only. */
	companyTrainer?: boolean;
	/** Courses the demo enrols the person in directly (seats and payment come later). */
	enrolments?: string[];
	/** What the person is in the demo, printed beside the login. */
	part: string;
}

export const DEMO_PROVIDER = 'Fenmoor Training Yard';
export const DEMO_COMPANIES = ['Brindlewick Drainage', 'Tarnside Pipe Works'] as const;

export const DEMO_PEOPLE: DemoPerson[] = [
	{ name: 'Rowan Ashdown', email: 'registrar@fenmoor.test', roles: ['registrar'], part: 'registrar at the training provider' },
	{ name: 'Mira Calloway', email: 'trainer@fenmoor.test', roles: ['trainer'], part: 'trainer at the training provider' },
	{ name: 'Theo Brannock', email: 'inspector@waterboard.test', roles: ['inspector'], part: "pipe owner's site inspector" },
	{ name: 'Jo Penhallow', email: 'admin@brindlewick.test', roles: [], company: { name: 'Brindlewick Drainage', role: 'admin' }, part: 'company admin, Brindlewick Drainage' },
	{ name: 'Sam Okafor', email: 'sam@brindlewick.test', roles: [], company: { name: 'Brindlewick Drainage', role: 'member' }, part: 'trainee, Brindlewick Drainage', enrolments: ['point-repair-installer', 'packer-pressure-safety'] },
	{ name: 'Priya Venn', email: 'priya@brindlewick.test', roles: [], company: { name: 'Brindlewick Drainage', role: 'member' }, part: 'trainee, Brindlewick Drainage', enrolments: ['point-repair-installer', 'packer-pressure-safety'] },
	{ name: 'Luca Marsh', email: 'luca@brindlewick.test', roles: [], company: { name: 'Brindlewick Drainage', role: 'member' }, part: 'trainee, Brindlewick Drainage', enrolments: ['point-repair-installer', 'packer-pressure-safety'] },
	{ name: 'Dana Whitlow', email: 'admin@tarnside.test', roles: ['trainer'], company: { name: 'Tarnside Pipe Works', role: 'admin' }, companyTrainer: true, part: 'company admin and company trainer (own crew only), Tarnside Pipe Works' },
	{ name: 'Ade Kowal', email: 'ade@tarnside.test', roles: [], company: { name: 'Tarnside Pipe Works', role: 'member' }, part: 'trainee, Tarnside Pipe Works', enrolments: ['point-repair-installer', 'transition-patches', 'packer-pressure-safety'] },
	{ name: 'Finn Ostrander', email: 'finn@tarnside.test', roles: [], company: { name: 'Tarnside Pipe Works', role: 'member' }, part: 'trainee, Tarnside Pipe Works', enrolments: ['point-repair-installer', 'transition-patches', 'packer-pressure-safety'] }
];
