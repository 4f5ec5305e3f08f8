import { type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Role, roleLabels } from '@shared/roles';
import { paths } from '@/config/paths';
import { type TestPage, launchBrowser, openPage } from './helpers/browser';
import { type RunningServer, startServer } from './helpers/server';
import { fillSignIn } from './helpers/session';

// The demo people of issue 2 (seeded on an empty database outside production), each with one role.
const demoPeople: { email: string; role: Role; nav: string[] }[] = [
  { email: 'admin@tallowmere.test', role: 'admin', nav: ['Home', 'Comparisons', 'Adoption policy', 'People', 'Outbox'] },
  { email: 'modeler@tallowmere.test', role: 'modeler', nav: ['Home', 'Comparisons', 'New comparison', 'Adoption policy'] },
  { email: 'analyst@tallowmere.test', role: 'analyst', nav: ['Home', 'Comparisons', 'Adoption policy'] },
  { email: 'policy@tallowmere.test', role: 'policy', nav: ['Home', 'Comparisons', 'Adoption policy'] },
  { email: 'committee@tallowmere.test', role: 'committee', nav: ['Home', 'Comparisons', 'Adoption policy'] },
  { email: 'committee2@tallowmere.test', role: 'committee', nav: ['Home', 'Comparisons', 'Adoption policy'] },
];

let server: RunningServer;
let browser: Browser;

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function mainNav(tab: TestPage): Promise<string[]> {
  const links = tab.page.getByRole('navigation', { name: 'Main' }).getByRole('link');
  return (await links.allTextContents()).map((text) => text.trim());
}

describe('sign-in and navigation by role', () => {
  for (const person of demoPeople) {
    it(`${person.email} signs in, sees the navigation of the ${person.role} role, and signs out`, async () => {
      const tab = await openPage(browser, server.url);
      try {
        await tab.page.goto(paths.auth.signIn());
        await expect.poll(() => tab.page.title()).toBe('Sign in · Scorecourt');
        await fillSignIn(tab.page, person.email);

        await tab.page.getByRole('heading', { level: 1, name: /^Welcome, / }).waitFor();
        expect(new URL(tab.page.url()).pathname).toBe(paths.home());
        expect(await mainNav(tab)).toEqual(person.nav);
        const header = await tab.page.getByTestId('signed-in-person').innerText();
        expect(header).toContain(roleLabels[person.role]);
        // The welcome page describes the person's own role.
        await tab.page.getByRole('heading', { level: 3, name: roleLabels[person.role] }).waitFor();
        await tab.screenshot(`home-${person.email.split('@')[0]}`);

        await tab.page.getByRole('button', { name: 'Sign out' }).click();
        await tab.page.getByRole('heading', { name: 'You have signed out' }).or(tab.page.getByText('You have signed out')).first().waitFor();
        expect(new URL(tab.page.url()).pathname).toBe(paths.auth.signIn.pattern);
        // Signed out for real: the home page sends us back to sign-in.
        await tab.page.goto(paths.home());
        await tab.page.getByRole('button', { name: 'Sign in' }).waitFor();

        expect(tab.unexpectedErrors()).toEqual([]);
      } finally {
        await tab.close();
      }
    });
  }
});

describe('guards', () => {
  it('sends a signed-out visitor to sign-in and back to the page they asked for', async () => {
    const tab = await openPage(browser, server.url);
    try {
      await tab.page.goto(paths.admin.people());
      await tab.page.getByRole('button', { name: 'Sign in' }).waitFor();
      const url = new URL(tab.page.url());
      expect(url.pathname).toBe(paths.auth.signIn.pattern);
      expect(url.searchParams.get('next')).toBe(paths.admin.people());
      await tab.screenshot('sign-in');

      await fillSignIn(tab.page, 'admin@tallowmere.test');
      await tab.page.getByRole('heading', { level: 1, name: 'People' }).waitFor();
      expect(new URL(tab.page.url()).pathname).toBe(paths.admin.people());
      // Every demo person is listed with their role.
      for (const person of demoPeople) await tab.page.getByRole('cell', { name: person.email }).waitFor();
      await tab.screenshot('admin-people');
      expect(tab.unexpectedErrors()).toEqual([]);
    } finally {
      await tab.close();
    }
  });

  it('shows a page of another role as a refusal that names the role needed', async () => {
    const tab = await openPage(browser, server.url);
    try {
      await tab.page.goto(paths.auth.signIn());
      await fillSignIn(tab.page, 'modeler@tallowmere.test');
      await tab.page.getByRole('heading', { level: 1, name: /^Welcome, / }).waitFor();

      await tab.page.goto(paths.admin.outbox());
      await tab.page.getByRole('heading', { level: 1, name: 'Outbox needs another role' }).waitFor();
      const main = await tab.page.getByRole('main').innerText();
      expect(main).toContain(`open to people with the ${roleLabels.admin} role`);
      expect(main).toContain(roleLabels.modeler);
      // The shell stays: the person can go on from here.
      expect(await mainNav(tab)).toEqual(['Home', 'Comparisons', 'New comparison', 'Adoption policy']);
      await tab.screenshot('refusal-modeler-outbox');
      expect(tab.unexpectedErrors()).toEqual([]);
    } finally {
      await tab.close();
    }
  });

  it('shows a clear page for an address that does not exist', async () => {
    const tab = await openPage(browser, server.url);
    try {
      await tab.page.goto(paths.auth.signIn());
      await fillSignIn(tab.page, 'analyst@tallowmere.test');
      await tab.page.getByRole('heading', { level: 1, name: /^Welcome, / }).waitFor();
      await tab.page.goto('/no-such-page');
      await tab.page.getByRole('heading', { level: 1, name: 'Page not found' }).waitFor();
      expect(tab.unexpectedErrors()).toEqual([]);
    } finally {
      await tab.close();
    }
  });
});

describe('people and the outbox', () => {
  it('an admin invites a person, the e-mail reaches the outbox, and its link sets a password once', async () => {
    const admin = await openPage(browser, server.url);
    const invitee = await openPage(browser, server.url);
    const email = `e2e-${Date.now()}@tallowmere.test`;
    try {
      await admin.page.goto(paths.admin.people());
      await fillSignIn(admin.page, 'admin@tallowmere.test');
      await admin.page.getByRole('heading', { level: 1, name: 'People' }).waitFor();

      await admin.page.getByRole('button', { name: 'Invite a person' }).click();
      const dialog = admin.page.getByRole('dialog', { name: 'Invite a person' });
      await dialog.waitFor();
      // Submitting empty shows the schema's messages beside the fields.
      await dialog.getByRole('button', { name: 'Send invitation' }).click();
      await dialog.getByText('Choose at least one role').waitFor();
      await dialog.getByLabel('Full name').fill('Esme Test-Reader');
      await dialog.getByLabel('E-mail address').fill(email);
      await dialog.getByLabel(roleLabels.analyst).check();
      await admin.screenshot('admin-invite-dialog');
      await dialog.getByRole('button', { name: 'Send invitation' }).click();
      await admin.page.getByText(`Invitation sent to ${email}`).waitFor();
      await admin.page.getByRole('cell', { name: email }).waitFor();

      // The invitation in the outbox; its text holds the one-time link.
      await admin.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Outbox' }).click();
      await admin.page.getByRole('heading', { level: 1, name: 'Outbox' }).waitFor();
      const row = admin.page.getByRole('row').filter({ hasText: email });
      await row.waitFor();
      await admin.screenshot('admin-outbox');
      await row.getByRole('button').first().click();
      const message = admin.page.getByRole('dialog');
      await message.waitFor();
      const text = await message.getByRole('document').innerText();
      const link = /\/accept\/[A-Za-z0-9._~%-]+/.exec(text);
      expect(link, `no /accept/<token> link in the invitation:\n${text}`).not.toBeNull();
      await admin.screenshot('admin-outbox-message');
      await admin.page.keyboard.press('Escape');
      await message.waitFor({ state: 'hidden' });

      // The invitee opens the link in their own browser, chooses a password and is signed in.
      await invitee.page.goto(link![0]);
      await invitee.page.getByRole('heading', { level: 1, name: /Esme Test-Reader/ }).waitFor();
      await invitee.screenshot('accept-invitation');
      await invitee.page.getByLabel('Choose a password').fill('a long enough password');
      await invitee.page.getByLabel('Type it again').fill('a long enough password');
      await invitee.page.getByRole('button', { name: /Set password and sign in/ }).click();
      await invitee.page.getByRole('heading', { level: 1, name: 'Welcome, Esme' }).waitFor();
      expect(await invitee.page.getByTestId('signed-in-person').innerText()).toContain(roleLabels.analyst);

      // The link works once.
      await invitee.page.goto(link![0]);
      await invitee.page.getByRole('heading', { level: 1, name: 'This link has been used or has expired' }).waitFor();
      await invitee.screenshot('accept-link-used');

      // The admin adds a role, then deactivates the account; the person's session ends.
      await admin.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'People' }).click();
      await admin.page.getByRole('button', { name: 'Change roles of Esme Test-Reader' }).click();
      const roles = admin.page.getByRole('dialog', { name: 'Roles of Esme Test-Reader' });
      await roles.getByLabel(roleLabels.committee).check();
      await roles.getByRole('button', { name: 'Save roles' }).click();
      await admin.page.getByText('Roles of Esme Test-Reader saved.').waitFor();
      const esme = admin.page.getByRole('row').filter({ hasText: email });
      expect(await esme.getByRole('listitem').allTextContents()).toEqual([roleLabels.analyst, roleLabels.committee]);

      await admin.page.getByRole('button', { name: 'Deactivate Esme Test-Reader' }).click();
      const confirm = admin.page.getByRole('dialog', { name: 'Deactivate Esme Test-Reader?' });
      await admin.screenshot('admin-deactivate-dialog');
      await confirm.getByRole('button', { name: 'Deactivate', exact: true }).click();
      await admin.page.getByText('Esme Test-Reader is deactivated and has been signed out.').waitFor();
      await esme.getByText('Inactive').waitFor();

      await invitee.page.goto(paths.home());
      await invitee.page.getByRole('button', { name: 'Sign in' }).waitFor();

      expect(admin.unexpectedErrors()).toEqual([]);
      expect(invitee.unexpectedErrors([/status of 410/])).toEqual([]);
    } finally {
      await admin.close();
      await invitee.close();
    }
  });
});

describe('password reset', () => {
  it('a person asks for a reset link, and the e-mailed link sets a new password', async () => {
    const person = await openPage(browser, server.url);
    const admin = await openPage(browser, server.url);
    const email = 'committee2@tallowmere.test';
    try {
      await person.page.goto(paths.auth.signIn());
      await person.page.getByRole('link', { name: 'Forgot your password?' }).click();
      await person.page.getByRole('heading', { level: 1, name: 'Reset your password' }).waitFor();
      await person.page.getByLabel('E-mail address').fill(email);
      await person.page.getByRole('button', { name: 'Send reset link' }).click();
      await person.page.getByText('Check your e-mail').waitFor();
      await person.screenshot('forgot-password-sent');

      // The link, read from the outbox by an admin (the SMTP sink stands in for the person's inbox).
      await admin.page.goto(paths.admin.outbox());
      await fillSignIn(admin.page, 'admin@tallowmere.test');
      await admin.page.getByRole('heading', { level: 1, name: 'Outbox' }).waitFor();
      const row = admin.page.getByRole('row').filter({ hasText: email }).first();
      await row.waitFor();
      await row.getByRole('button').first().click();
      const text = await admin.page.getByRole('dialog').getByRole('document').innerText();
      const link = /\/accept\/[A-Za-z0-9._~%-]+/.exec(text);
      expect(link, `no /accept/<token> link in the reset e-mail:\n${text}`).not.toBeNull();

      await person.page.goto(link![0]);
      await person.page.getByRole('heading', { level: 1, name: 'Choose a new password' }).waitFor();
      await person.screenshot('reset-password');
      await person.page.getByLabel('New password').fill('committee two new password');
      await person.page.getByLabel('Type it again').fill('committee two new password');
      await person.page.getByRole('button', { name: /Save new password and sign in/ }).click();
      await person.page.getByRole('heading', { level: 1, name: /^Welcome, / }).waitFor();

      expect(person.unexpectedErrors()).toEqual([]);
      expect(admin.unexpectedErrors()).toEqual([]);
    } finally {
      await person.close();
      await admin.close();
    }
  });
});

describe('sign-in failures', () => {
  it('says so when the password is wrong', async () => {
    const tab = await openPage(browser, server.url);
    try {
      await tab.page.goto(paths.auth.signIn());
      await fillSignIn(tab.page, 'policy@tallowmere.test', 'not-the-password');
      await tab.page.getByRole('alert').filter({ hasText: 'Sign-in failed' }).waitFor();
      expect(new URL(tab.page.url()).pathname).toBe(paths.auth.signIn.pattern);
      await tab.screenshot('sign-in-wrong-password');
    } finally {
      await tab.close();
    }
  });

  // Last in this file: it trips the sign-in rate limit for this address.
  it('shows the rate-limit message after repeated failures', async () => {
    const tab = await openPage(browser, server.url);
    try {
      await tab.page.goto(paths.auth.signIn());
      const email = 'nobody@tallowmere.test';
      for (let attempt = 0; attempt < 12; attempt += 1) {
        await fillSignIn(tab.page, email, `wrong-${attempt}`);
        const alert = tab.page.getByRole('alert');
        await alert.waitFor();
        if ((await alert.innerText()).includes('Sign-in is paused')) break;
      }
      await tab.page.getByRole('alert').filter({ hasText: 'Sign-in is paused' }).waitFor();
      await tab.screenshot('sign-in-rate-limited');
    } finally {
      await tab.close();
    }
  });
});
