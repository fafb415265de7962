import type { Metadata } from "next";
import { StatusPage } from "@/components/layout/status-page";

export const metadata: Metadata = { title: "Not found" };

/** 404 for any address without a page, and for records that do not exist or belong to a project you are not in. */
export default function NotFound() {
  return (
    <StatusPage code="404" title="Nothing here">
      <p>This page does not exist, or it belongs to a project you are not a member of.</p>
      <p>Check the address, or ask the project lead to invite you.</p>
    </StatusPage>
  );
}
