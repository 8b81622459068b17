import { NextResponse } from "next/server";
import { emailCategoryInfo } from "@/lib/email/categories";
import { apiRoute } from "@/server/api-route";
import { HttpError } from "@/server/http-error";
import { unsubscribeWithToken } from "@/server/unsubscribe";

/**
 * RFC 8058 one-click unsubscribe. Mail clients POST `List-Unsubscribe=One-Click` (form-encoded or
 * multipart) to the URL in the List-Unsubscribe header, without cookies; the signed token in the
 * query names the person and the category, so no sign-in is needed and nothing else can change.
 */
export const POST = apiRoute({ role: "visitor" }, async ({ request }) => {
  const token = new URL(request.url).searchParams.get("token");
  let oneClick: FormDataEntryValue | null = null;
  try {
    oneClick = (await request.formData()).get("List-Unsubscribe");
  } catch {
    oneClick = null;
  }
  if (oneClick !== "One-Click") {
    throw new HttpError(400, "invalid_request", "Send List-Unsubscribe=One-Click as a form field.", {
      "List-Unsubscribe": "must be One-Click",
    });
  }
  const claim = unsubscribeWithToken(token);
  return { ok: true, category: claim.category, message: `Unsubscribed from “${emailCategoryInfo[claim.category].label}”.` };
});

/** A browser (or a link scanner) opening the link gets the confirmation page; only its button unsubscribes. */
export function GET(request: Request) {
  const source = new URL(request.url);
  const target = new URL("/email/unsubscribe", source);
  const token = source.searchParams.get("token");
  if (token) target.searchParams.set("token", token);
  return NextResponse.redirect(target, 303);
}
