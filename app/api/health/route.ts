import { NextResponse } from "next/server";
import { databaseStatus } from "@/lib/health";

export const dynamic = "force-dynamic";

export async function GET() {
  const status = await databaseStatus();
  return NextResponse.json(status, { status: status.ok ? 200 : 503 });
}
