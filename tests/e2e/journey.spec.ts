import { test } from '@playwright/test';
import { expect } from './support/expect';
import { freshEmail, waitForLink } from './support/mail';
import { SignUpPage, TeamDesignsPage, TeamSettingsPage, TeamsPage } from './support/pages';

// The whole first-day journey: sign up by e-mail link, build a team, invite a colleague who
// accepts and forks the design.
test('sign up, create a team and a design, invite a colleague who accepts and forks it', async ({ page, browser, request }) => {
  // Two people, two sign-ups by mail, about twenty page loads: longer than one screen's test.
  test.setTimeout(180_000);
  const ownerEmail = freshEmail('owner');
  const colleagueEmail = freshEmail('colleague');
  const teamName = `Bench ${Date.now().toString(36)}`;
  const designTitle = 'Detector bias, 6 stages';

  // --- the owner signs up and follows the sign-in link from the catcher ---
  await new SignUpPage(page).signUp({ name: 'Ada Owner', email: ownerEmail, password: 'correct-horse-42' });
  const ownerLink = await waitForLink(request, ownerEmail, '/api/auth/callback/email');
  await page.goto(ownerLink);
  const teams = new TeamsPage(page);
  await teams.expectLoaded();
  await expect(page.getByTestId('no-teams')).toBeVisible();

  // --- team and design ---
  const teamId = await teams.createTeam(teamName);
  const designs = new TeamDesignsPage(page);
  await designs.createDesign({ title: designTitle, starter: 'half-wave', stages: 6, amplitude: '250', frequency: '20k', capacitance: '10n' });
  await expect(page.getByTestId('summary-stages')).toContainText('6');
  await expect(page.getByTestId('summary-parts')).toContainText('12 capacitors, 12 diodes');
  await expect(page.getByTestId('revision-item')).toHaveCount(1);
  await expect(page.getByTestId('design-visibility')).toHaveText('shared with team');

  // --- invite the colleague as designer ---
  const settings = new TeamSettingsPage(page);
  await settings.open(teamId);
  await settings.invite(colleagueEmail, 'designer');

  // --- the colleague, in a browser of their own ---
  const colleagueContext = await browser.newContext();
  const colleague = await colleagueContext.newPage();
  await new SignUpPage(colleague).signUp({ name: 'Bo Colleague', email: colleagueEmail, password: 'another-pass-77' });
  const colleagueLink = await waitForLink(request, colleagueEmail, '/api/auth/callback/email');
  await colleague.goto(colleagueLink);
  await new TeamsPage(colleague).expectLoaded();

  const inviteLink = await waitForLink(request, colleagueEmail, '/invitations/');
  await colleague.goto(inviteLink);
  await expect(colleague.getByTestId('invitation-team')).toHaveText(teamName);
  await colleague.getByTestId('invitation-accept').click();
  await expect(colleague).toHaveURL(new RegExp(`/teams/${teamId}$`));
  await expect(colleague.getByTestId('team-name')).toHaveText(teamName);

  // --- the colleague forks the design ---
  const colleagueDesigns = new TeamDesignsPage(colleague);
  await colleagueDesigns.openDesign(designTitle);
  const parentUrl = colleague.url();
  await colleague.getByTestId('fork-design').click();
  await expect(colleague).not.toHaveURL(parentUrl);
  await expect(colleague).toHaveURL(/\/designs\/[0-9a-f-]{36}$/);
  await expect(colleague.getByTestId('forked-from')).toContainText(`Forked from ${designTitle}`);
  await expect(colleague.getByTestId('forked-from')).toContainText('r1');
  await expect(colleague.getByTestId('summary-stages')).toContainText('6');

  // The parent is untouched and now lists the fork.
  await colleague.goto(parentUrl);
  await expect(colleague.getByTestId('design-title')).toHaveText(designTitle);
  await expect(colleague.getByTestId('forked-from')).toHaveCount(0);
  await expect(colleague.getByTestId('forks-panel')).toContainText('Bo Colleague');

  // The owner sees the fork in the team list with its parent.
  await page.goto(`/teams/${teamId}`);
  await expect(new TeamDesignsPage(page).rows()).toHaveCount(2);
  await expect(page.getByTestId('design-row').filter({ hasText: `${designTitle} r1` })).toHaveCount(1);

  await colleagueContext.close();
});
