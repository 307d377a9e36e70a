import type { Role } from '../src/lib/permissions';

/**
 * The demo team of Marrowgate Instruments, an invented maker of laboratory electrometers
 * and ion-meter front ends. Everyone here is fictional.
 */
export const DEMO_PEOPLE: { email: string; name: string; roles: Role[] }[] = [
	{ email: 'designer@demo.test', name: 'Oona Vettergren', roles: ['designer'] },
	{ email: 'librarian@demo.test', name: 'Tobiah Quell', roles: ['librarian'] },
	{ email: 'lead@demo.test', name: 'Marisol Achterberg', roles: ['lead'] },
	{ email: 'admin@demo.test', name: 'Ferris Nakamura-Lund', roles: ['admin'] }
];
