import { expect, type Page } from "@playwright/test";
import { latestSignInLink } from "./inbox";

/** Signs in the real way: request a link, read it from the fake inbox, confirm with the button. */
export class SignInPage {
  constructor(
    private readonly page: Page,
    private readonly appPort: number,
  ) {}

  async requestLink(email: string, callbackUrl = "/"): Promise<string> {
    const since = new Date().toISOString();
    await this.page.goto(`/sign-in?callbackUrl=${encodeURIComponent(callbackUrl)}`);
    await this.page.getByLabel("E-mail address").fill(email);
    await this.page.getByRole("button", { name: "E-mail me a sign-in link" }).click();
    await expect(this.page.getByRole("heading", { name: "Check your e-mail" })).toBeVisible();
    return latestSignInLink(this.appPort, email, since);
  }

  async signIn(email: string, callbackUrl = "/"): Promise<void> {
    const link = await this.requestLink(email, callbackUrl);
    await this.page.goto(link);
    await expect(this.page.getByRole("heading", { name: "Finish signing in" })).toBeVisible();
    await this.page.getByRole("button", { name: "Sign in to Proofbay" }).click();
    await this.page.waitForURL((url) => !url.pathname.startsWith("/sign-in") && !url.pathname.startsWith("/api/auth"));
  }
}
