import { describe, expect, it } from 'vitest';
import { catcherBaseUrl, linksInMail } from './catcher';
import { renderMail } from './templates';

describe('catcherBaseUrl', () => {
	it('is null when MAIL_CATCHER_URL is unset or blank', () => {
		expect(catcherBaseUrl(undefined)).toBeNull();
		expect(catcherBaseUrl('   ')).toBeNull();
	});

	it('takes http addresses on this machine only', () => {
		expect(catcherBaseUrl('http://127.0.0.1:2580')?.href).toBe('http://127.0.0.1:2580/');
		expect(catcherBaseUrl('http://localhost:2580/')?.href).toBe('http://localhost:2580/');
		expect(catcherBaseUrl('http://[::1]:2580')?.href).toBe('http://[::1]:2580/');
		expect(catcherBaseUrl('http://mail.example.com:2580')).toBeNull();
		expect(catcherBaseUrl('https://127.0.0.1:2580')).toBeNull();
		expect(catcherBaseUrl('http://127.0.0.1.example.com')).toBeNull();
		expect(catcherBaseUrl('not a url')).toBeNull();
	});
});

describe('linksInMail', () => {
	it('finds anchor hrefs with entities decoded, then text addresses, each once', () => {
		const links = linksInMail({
			html: `<p><a href="https://shop.example.com/v?t=1&amp;n=%2F">go</a>
				<a href='http://127.0.0.1:3000/x'>x</a> <a href="#top">top</a>
				<a href="mailto:shop@example.com">mail</a></p>`,
			text: 'Open https://shop.example.com/v?t=1&n=%2F or (https://help.example.com/a).'
		});
		expect(links).toEqual([
			'https://shop.example.com/v?t=1&n=%2F',
			'http://127.0.0.1:3000/x',
			'https://help.example.com/a'
		]);
	});

	it('finds the one link of a rendered sign-in mail', () => {
		const url = 'http://127.0.0.1:3000/auth/callback/nodemailer?token=ab12&email=a%40example.com';
		const mail = renderMail(
			{ kind: 'sign_in_link', to: 'a@example.com', url, expiresInMinutes: 15 },
			{ shopName: 'Mossback Hollow Inverts' }
		);
		expect(linksInMail(mail)).toEqual([url]);
	});

	it('copes with a message that has no HTML part', () => {
		expect(linksInMail({ html: null, text: 'nothing to follow here' })).toEqual([]);
	});
});
