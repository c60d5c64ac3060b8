// The demo shop's sign-ins: an invented workshop with invented staff.
// Shared by the seed (which creates them) and `npm start` (which prints them).
export const demoPassword = 'bench-demo-2026';

export const demoShopName = 'Kettle Street Motorcycle Works (demo)';

/** @type {{ email: string; name: string; role: 'owner' | 'service_writer' | 'foreman' | 'technician' }[]} */
export const demoAccounts = [
	{ email: 'owner@kettlestreet.test', name: 'Marta Lindqvist-Obi', role: 'owner' },
	{ email: 'desk@kettlestreet.test', name: 'Dev Ramanathan', role: 'service_writer' },
	{ email: 'foreman@kettlestreet.test', name: 'Ines Calloway', role: 'foreman' },
	{ email: 'tomasz@kettlestreet.test', name: 'Tomasz Veerman', role: 'technician' },
	{ email: 'ruth@kettlestreet.test', name: 'Ruth Adeyemi-Holt', role: 'technician' }
];

/** A second invented shop, so that shop scoping can be seen and tested. */
export const otherShopName = 'Harbour Lane Scooters (demo)';
export const otherAccounts = [
	{ email: 'owner@harbourlane.test', name: 'Pia Svensgaard', role: 'owner' },
	{ email: 'tech@harbourlane.test', name: 'Kofi Brandauer', role: 'technician' }
];
