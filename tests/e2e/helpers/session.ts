/** Signing in through the sign-in page as one of the demo people (seeded on an empty database). */
import { type Page } from 'playwright-core';
import { paths } from '@/config/paths';

export const DEMO_PASSWORD = 'scorecourt-demo';

export type DemoPerson = 'admin' | 'modeler' | 'analyst' | 'policy' | 'committee' | 'committee2';

/** Fills and sends the sign-in form on the current page (it must be the sign-in page). */
export async function fillSignIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** Opens sign-in, signs in as the demo person and waits for the home page. */
export async function signInAs(page: Page, person: DemoPerson): Promise<void> {
  await page.goto(paths.auth.signIn());
  await fillSignIn(page, `${person}@tallowmere.test`);
  await page.getByRole('heading', { level: 1, name: /^Welcome, / }).waitFor();
}
