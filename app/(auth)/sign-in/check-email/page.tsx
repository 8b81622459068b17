import type { Metadata } from "next";
import { MailCheck } from "lucide";
import { Icon } from "@/components/ui/icon";
import { Card } from "@/components/ui/card";

export const metadata: Metadata = { title: "Check your e-mail" };

export default function CheckEmailPage() {
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <Card className="flex flex-col items-start gap-3">
        <Icon node={MailCheck} className="h-8 w-8 text-teal" />
        <h1 className="text-2xl font-bold">Check your e-mail</h1>
        <p>We sent you a sign-in link. Open it on this device, then press the button on the page it opens.</p>
        <p className="text-sm text-muted">The link works once and expires in 10 minutes. Nothing arrived? Look in spam, or ask for a new link.</p>
      </Card>
    </div>
  );
}
