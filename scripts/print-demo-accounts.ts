// Prints the demo sign-ins that the seed creates (npm start shows them).
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../seed/accounts';

console.log('\nDemo accounts (Mossback Hollow Inverts):');
for (const account of DEMO_ACCOUNTS) {
	console.log(`  ${account.role.padEnd(8)} ${account.name.padEnd(18)} ${account.email}`);
}
console.log(`  password for every demo account: ${DEMO_PASSWORD}\n`);
