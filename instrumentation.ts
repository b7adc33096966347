export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { prepareServer } = await import("./lib/startup");
  await prepareServer();
}
