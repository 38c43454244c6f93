/**
 * Which of Patchwright's capabilities are in service in this build. Pages word their promises
 * from these flags so that nobody is told to do what the product cannot do yet. The engineer
 * who lands a capability sets its flag and fills the dashboard section that reads it
 * (src/lib/components/dashboard/).
 */
export const capabilities = {
	/** Trainers record practical sign-offs against each criterion. */
	signOffs: true,
	/** Company admins buy seats and assign them; a person buys one seat. */
	seats: true,
	/** Certificates are issued (PDF and signed credential). */
	certificates: true,
	/** Anyone checks a certificate by number, QR link or PDF. */
	verification: true
};

export type Capability = keyof typeof capabilities;

/** Each capability in a crew's words, for the "what works today" lists. */
export const capabilityWords: { id: Capability | 'lessons' | 'calculators' | 'practice' | 'test'; title: string; live: boolean; today: string }[] = [
	{ id: 'lessons', title: 'Lessons', live: true, today: 'Short lessons with diagrams and cautions; the first of each course are open to everyone.' },
	{ id: 'calculators', title: 'Field calculators', live: true, today: 'Resin, pressure window, end thrust, cure time and test allowances, each with worked steps and sources.' },
	{ id: 'practice', title: 'Practice problems', live: true, today: 'Computed job figures with instant feedback; practice never counts.' },
	{ id: 'test', title: 'Course test', live: true, today: 'Graded on the server, with a review of every answer once submitted.' },
	{
		id: 'signOffs',
		title: 'Practical sign-offs',
		live: capabilities.signOffs,
		today: capabilities.signOffs ? 'A trainer grades each practical skill against its criteria.' : 'Not recorded in Patchwright yet: your trainer watches and records each practical skill on paper for now.'
	},
	{
		id: 'seats',
		title: 'Seats and payment',
		live: capabilities.seats,
		today: capabilities.seats ? 'Company admins buy seats and assign them to the crew.' : 'Not on sale in Patchwright yet: the training provider’s registrar enrols each trainee.'
	},
	{
		id: 'certificates',
		title: 'Certificates',
		live: capabilities.certificates,
		today: capabilities.certificates ? 'Issued once the test is passed and every sign-off is in.' : 'Not issued by Patchwright yet: passing the course test is recorded and will count toward one.'
	},
	{
		id: 'verification',
		title: 'Certificate checks',
		live: capabilities.verification,
		today: capabilities.verification ? 'Anyone can check a certificate by number, QR code or PDF.' : 'Open once the first certificates are issued.'
	}
];
