import type { Page } from '@playwright/test';
import { expect } from './expect';

/** Small page objects over Kilorung's screens; they use labels (what a person reads) and data-testid. */

export class SignUpPage {
  constructor(private readonly page: Page) {}
  async signUp(opts: { name: string; email: string; password: string; callbackUrl?: string }) {
    await this.page.goto(opts.callbackUrl ? `/signup?callbackUrl=${encodeURIComponent(opts.callbackUrl)}` : '/signup');
    await this.page.getByLabel('Name', { exact: true }).fill(opts.name);
    await this.page.getByLabel('E-mail', { exact: true }).fill(opts.email);
    await this.page.getByLabel('Password', { exact: true }).fill(opts.password);
    await this.page.getByTestId('signup-submit').click();
    // Creating the account and sending the link mail are two round trips (and SMTP).
    await expect(this.page).toHaveURL(/\/check-email/, { timeout: 20_000 });
    await expect(this.page.getByTestId('check-email')).toContainText(opts.email);
  }
}

export class SignInPage {
  constructor(private readonly page: Page) {}
  async withPassword(email: string, password: string) {
    await this.page.goto('/signin');
    await this.withPasswordHere(email, password);
  }
  /** Signs in on the sign-in page already open (e.g. after a redirect that carries a callbackUrl). */
  async withPasswordHere(email: string, password: string) {
    await this.page.getByLabel('E-mail', { exact: true }).fill(email);
    await this.page.getByLabel('Password', { exact: true }).fill(password);
    // Enter submits the form (keyboard path).
    await this.page.getByLabel('Password', { exact: true }).press('Enter');
    await expect(this.page).toHaveURL(/\/teams$/);
  }
}

export class TeamsPage {
  constructor(private readonly page: Page) {}
  async expectLoaded() {
    await expect(this.page.getByRole('heading', { name: 'Your teams' })).toBeVisible();
  }
  async createTeam(name: string): Promise<string> {
    await this.page.getByTestId('new-team-link').click();
    await this.page.getByLabel('Team name').fill(name);
    await this.page.getByTestId('new-team-submit').click();
    await expect(this.page).toHaveURL(/\/teams\/[0-9a-f-]{36}$/);
    await expect(this.page.getByTestId('team-name')).toHaveText(name);
    return new URL(this.page.url()).pathname.split('/').pop() as string;
  }
  async openTeam(name: string) {
    await this.page.getByTestId('team-link').filter({ hasText: name }).click();
    await expect(this.page.getByTestId('team-name')).toHaveText(name);
  }
}

export class TeamDesignsPage {
  constructor(private readonly page: Page) {}
  rows() {
    return this.page.getByTestId('design-row');
  }
  async createDesign(opts: { title: string; starter: 'half-wave' | 'full-wave' | 'symmetric'; stages: number; amplitude: string; frequency: string; capacitance: string }): Promise<string> {
    await this.page.getByTestId('new-design').click();
    const dialog = this.page.getByTestId('new-design-dialog');
    await expect(dialog).toBeVisible();
    await dialog.getByLabel('Title').fill(opts.title);
    await dialog.getByTestId(`starter-${opts.starter}`).check({ force: true });
    await dialog.getByLabel('Stages').fill(String(opts.stages));
    await dialog.getByLabel(/Drive amplitude/).fill(opts.amplitude);
    await dialog.getByLabel('Frequency (Hz)').fill(opts.frequency);
    await dialog.getByLabel('Stage capacitance (F)').fill(opts.capacitance);
    await dialog.getByTestId('new-design-submit').click();
    await expect(this.page).toHaveURL(/\/designs\/[0-9a-f-]{36}$/);
    await expect(this.page.getByTestId('design-title')).toHaveText(opts.title);
    return new URL(this.page.url()).pathname.split('/').pop() as string;
  }
  /** A design with nothing drawn, to be built from the tray. */
  async createBlankDesign(title: string): Promise<string> {
    await this.page.getByTestId('new-design').click();
    const dialog = this.page.getByTestId('new-design-dialog');
    await expect(dialog).toBeVisible();
    await dialog.getByLabel('Title').fill(title);
    await dialog.getByTestId('starter-blank').check({ force: true });
    await dialog.getByTestId('new-design-submit').click();
    await expect(this.page).toHaveURL(/\/designs\/[0-9a-f-]{36}$/);
    await expect(this.page.getByTestId('design-title')).toHaveText(title);
    return new URL(this.page.url()).pathname.split('/').pop() as string;
  }
  async openDesign(title: string) {
    await this.page.getByTestId('design-link').filter({ hasText: title }).first().click();
    await expect(this.page.getByTestId('design-title')).toHaveText(title);
  }
}

export class TeamSettingsPage {
  constructor(private readonly page: Page) {}
  async open(teamId: string) {
    await this.page.goto(`/teams/${teamId}/settings`);
    await expect(this.page.getByTestId('members-panel')).toBeVisible();
  }
  async invite(email: string, role: 'owner' | 'designer' | 'reviewer' | 'viewer') {
    const form = this.page.getByTestId('invite-form');
    await form.getByLabel('E-mail').fill(email);
    await form.getByLabel('Role').selectOption(role);
    await form.getByTestId('invite-submit').click();
    await expect(this.page.getByTestId('invite-sent')).toContainText(email);
    await expect(this.page.getByTestId('invitation-row').filter({ hasText: email })).toBeVisible();
  }
}
