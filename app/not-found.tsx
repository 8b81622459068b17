import Link from "next/link";
import { SearchX } from "lucide";
import { Icon } from "@/components/ui/icon";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";

export default function NotFound() {
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <Card className="flex flex-col items-start gap-3">
        <Icon node={SearchX} className="h-8 w-8 text-teal" />
        <h1 className="text-2xl font-bold">Nothing printed here</h1>
        <p>We could not find that page. It may have moved, or the address has a typo.</p>
        <Button asChild>
          <Link href="/">See the campaigns</Link>
        </Button>
      </Card>
    </div>
  );
}
