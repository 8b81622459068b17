import { redirect } from "next/navigation";

export default function LabHome() {
  redirect("/lab/proposals");
}
