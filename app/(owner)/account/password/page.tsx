import type { Metadata } from "next";
import { ChangePasswordForm } from "@/components/auth/change-password-form";
import { Card, PageHeader } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { changePasswordAction } from "./actions";

export const metadata: Metadata = { title: "Change password" };

export default async function ChangePasswordPage() {
  await forPage(requireUser);
  return (
    <>
      <PageHeader title="Change password" />
      <Card>
        <ChangePasswordForm action={changePasswordAction} />
      </Card>
    </>
  );
}
