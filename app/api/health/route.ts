import { NextResponse } from "next/server";
import { healthStatus } from "@/lib/health";

export const dynamic = "force-dynamic";

export async function GET() {
  const status = await healthStatus();
  return NextResponse.json(status, { status: status.ok ? 200 : 503 });
}
