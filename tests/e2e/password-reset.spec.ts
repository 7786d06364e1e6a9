import { expect, test } from '@playwright/test';
import { DEMO_PROJECT, apiPost, signInViaApi, signInViaForm, waitForMailedLink } from './support';

test('a user who forgot the password sets a new one from the mailed link', async ({ page, browser }) => {
  // A user of our own (not a demo account), so other tests keep their passwords.
  const email = `forgetful.${Date.now()}@example.test`;
  const firstPassword = 'first-passphrase-of-ours';
  const newPassword = 'second-passphrase-of-ours';

  await signInViaApi(page.request, 'admin');
  const projects = (await (await page.request.get('/api/projects')).json()) as { items: { id: string; name: string }[] };
  const project = projects.items.find((p) => p.name === DEMO_PROJECT);
  expect(project, DEMO_PROJECT).toBeTruthy();
  await apiPost(page.request, '/api/admin/invitations', { email, projectId: project?.id, role: 'viewer' });
  const invitePath = await waitForMailedLink(page.request, email, '/invite/');

  const userContext = await browser.newContext();
  try {
    const user = await userContext.newPage();
    await apiPost(user.request, `/api/invitations/${invitePath.split('/').pop()}/accept`, { name: 'Fay Forgetful (e2e)', password: firstPassword });
    await apiPost(user.request, '/api/auth/logout', {});

    await user.goto('/sign-in');
    await user.getByRole('link', { name: 'Forgot your password?' }).click();
    // The form view is loaded lazily: wait for it, or the fill may land in the sign-in page's
    // own E-mail field just before the route changes.
    await expect(user.getByRole('heading', { name: 'Forgot your password?' })).toBeVisible();
    await user.getByLabel('E-mail').fill(email);
    await expect(user.getByLabel('E-mail')).toHaveValue(email);
    await user.getByRole('button', { name: 'Send link' }).click();
    await expect(user.getByTestId('reset-requested')).toContainText(email);

    const resetPath = await waitForMailedLink(page.request, email, '/reset/');
    await user.goto(resetPath);
    await user.getByLabel('New password', { exact: true }).fill(newPassword);
    await user.getByLabel('Repeat the new password').fill(newPassword);
    await user.getByRole('button', { name: 'Save password' }).click();
    await expect(user.getByTestId('reset-done')).toBeVisible();

    await user.getByRole('link', { name: 'Go to sign in' }).click();
    await signInViaForm(user, email, newPassword);
    await expect(user).toHaveURL(/\/projects$/);
    await expect(user.getByTestId('account-menu')).toContainText('Fay Forgetful (e2e)');

    // The old password is gone, and the link cannot be used twice.
    const csrf = (await (await user.request.get('/api/auth/csrf')).json()) as { token: string };
    const old = await user.request.post('/api/auth/login', {
      data: { email, password: firstPassword },
      headers: { 'x-csrf-token': csrf.token },
    });
    expect(old.status()).toBe(401);
    const again = await userContext.newPage();
    await again.goto(resetPath);
    await again.getByLabel('New password', { exact: true }).fill(firstPassword);
    await again.getByLabel('Repeat the new password').fill(firstPassword);
    await again.getByRole('button', { name: 'Save password' }).click();
    await expect(again.getByRole('alert')).toContainText(/./);
    await expect(again.getByTestId('reset-done')).toHaveCount(0);
  } finally {
    await userContext.close();
  }
});
