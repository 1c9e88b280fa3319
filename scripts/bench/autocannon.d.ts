// autocannon ships no types; the bench uses its programmatic API (a promise-like instance that emits
// "response" with the response time in ms).
declare module "autocannon" {
  type Instance = PromiseLike<{ requests: { total: number }; errors: number; timeouts: number; non2xx: number }> & {
    on(event: "response", listener: (client: unknown, status: number, bytes: number, ms: number) => void): void;
  };
  function autocannon(options: Record<string, unknown>): Instance;
  export default autocannon;
}
