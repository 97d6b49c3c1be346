// Prints the demo sign-ins that the seed creates (npm start shows them).
import { DEMO_ACCOUNTS } from '../seed/accounts';

console.log('\nDemo accounts (Mossback Hollow Inverts):');
for (const account of DEMO_ACCOUNTS) {
	console.log(`  ${account.role.padEnd(8)} ${account.name.padEnd(18)} ${account.email}`);
}
console.log('');
