// The app in real headless chromium. Each test gets { context, server, offHost, state }.
import assert from 'node:assert/strict';

async function open(ctx) {
  const page = ctx.context.pages()[0] ?? (await ctx.context.newPage());
  const errors = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  await page.goto(ctx.server.origin + '/');
  return { page, errors };
}

export const tests = [
  {
    name: 'the page loads and renders',
    fn: async (ctx) => {
      const { page, errors } = await open(ctx);
      await page.waitForSelector('h1');
      assert.equal(await page.title(), 'preheard');
      assert.deepEqual(errors, []);
    },
  },
];
