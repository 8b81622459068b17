import Link from "next/link";
import { Unlink } from "lucide";
import { Icon } from "@/components/ui/icon";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";

const messages = {
  expired: {
    title: "This sign-in link has expired or was already used",
    text: "Links work once and for 10 minutes. Ask for a new one and open the newest e-mail.",
  },
  incomplete: {
    title: "This sign-in link is incomplete",
    text: "Part of the link is missing — your mail app may have split it. Ask for a new link.",
  },
  denied: { title: "Sign-in was refused", text: "This account cannot sign in. Contact the lab if you think that is wrong." },
  unavailable: {
    title: "Sign-in is not available right now",
    text: "Something on our side is not set up correctly. Try again later.",
  },
} as const;

export type LinkProblemReason = keyof typeof messages;

export function LinkProblem({ reason }: { reason: LinkProblemReason }) {
  const message = messages[reason];
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <Card className="flex flex-col items-start gap-3">
        <Icon node={Unlink} className="h-8 w-8 text-ember" />
        <h1 className="text-2xl font-bold">{message.title}</h1>
        <p>{message.text}</p>
        <Button asChild>
          <Link href="/sign-in">Get a new sign-in link</Link>
        </Button>
      </Card>
    </div>
  );
}
