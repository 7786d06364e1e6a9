import { expect, test } from '@playwright/test';
import { DEMO_PROJECT, signInViaApi } from './support';

test('an admin invites a user, who accepts from the mailed link and lands signed in', async ({ page, browser }) => {
  // A fresh address per run, so the test works on a database that earlier runs have used.
  const email = `new.engineer.${Date.now()}@example.test`;
  const name = 'Nia Newcomer (e2e)';
  const password = 'a-long-enough-passphrase';

  await signInViaApi(page.request, 'admin');
  await page.goto('/admin?tab=invitations');

  await page.getByLabel('E-mail').fill(email);
  await page.getByTestId('invite-project').click();
  await page.getByRole('option', { name: DEMO_PROJECT }).click();
  await page.getByTestId('invite-role').click();
  await page.getByRole('option', { name: /^Reviewer/ }).click();
  await page.getByTestId('send-invitation').click();

  const sent = page.getByTestId('invitations-table').getByRole('row').filter({ hasText: email });
  await expect(sent).toBeVisible();
  await expect(sent).toContainText('pending');

  // The mail goes through the local mail catcher and shows up in the Mailbox tab.
  await page.getByRole('tab', { name: 'Mailbox' }).click();
  await expect(page).toHaveURL(/tab=mailbox/);
  const mailItem = page.getByTestId('mail-item').filter({ hasText: email });
  await expect(async () => {
    await page.getByTestId('refresh-mail').click();
    await expect(mailItem.first()).toBeVisible({ timeout: 1_000 });
  }).toPass({ timeout: 20_000 });
  await mailItem.first().click();
  await expect(page.getByTestId('mail-to')).toContainText(email);

  const link = page.getByTestId('mail-body').getByTestId('mail-link').filter({ hasText: '/invite/' }).first();
  const href = await link.getAttribute('href');
  expect(href).toMatch(/\/invite\/[^/\s]+$/);
  // Follow the path on this test server, whatever host the mail was written for.
  const invitePath = new URL(href ?? '').pathname;

  const guestContext = await browser.newContext();
  try {
    const guest = await guestContext.newPage();
    await guest.goto(invitePath);
    const facts = guest.getByTestId('invitation-facts');
    await expect(facts).toContainText(email);
    await expect(facts).toContainText(DEMO_PROJECT);
    await expect(facts).toContainText('Reviewer');

    await guest.getByLabel('Your name').fill(name);
    await guest.getByLabel(/^Password/).fill(password);
    await guest.getByLabel('Repeat the password').fill(password);
    await guest.getByRole('button', { name: 'Accept and sign in' }).click();

    await expect(guest).toHaveURL(/\/projects\?welcome=1$/);
    await expect(guest.getByTestId('welcome')).toBeVisible();
    await expect(guest.getByTestId('account-menu')).toContainText(name);
    const row = guest.getByTestId('projects-table').getByRole('row').filter({ hasText: DEMO_PROJECT });
    await expect(row).toContainText('Reviewer');

    // The link works once: opening it again says so instead of offering the form.
    const again = await guestContext.newPage();
    await again.goto(invitePath);
    await expect(again.getByTestId('invitation-invalid')).toBeVisible();
  } finally {
    await guestContext.close();
  }

  // Back with the admin: the invitation now reads as accepted.
  await page.goto('/admin?tab=invitations');
  await expect(page.getByTestId('invitations-table').getByRole('row').filter({ hasText: email })).toContainText('accepted');
});
