import { apiAnswerFor, MethodNotAllowedError } from "./errors.server";

/**
 * An `/api` route module's loader and action from one handler per HTTP method:
 *
 *   const route = apiRoute<Route.LoaderArgs>({ GET: …, POST: … });
 *   export const loader = route.loader;
 *   export const action = route.action;
 *
 * A method without a handler answers 405 naming those with one, and whatever a handler throws —
 * the typed errors of the access check, the body reader and the models — is answered once, here,
 * in the API's error shape (errors.server.ts). An error of no known kind stays a 500: it is a
 * fault of ours, not of the request.
 */

type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
type Handler<Args> = (args: Args) => Promise<Response>;

export function apiRoute<Args extends { request: Request }>(handlers: Partial<Record<Method, Handler<Args>>>): { loader: Handler<Args>; action: Handler<Args> } {
  const allowed = Object.keys(handlers) as Method[];
  const answer = async (args: Args): Promise<Response> => {
    // React Router sends HEAD to the loader; it is a GET without the body.
    const method = args.request.method.toUpperCase() === "HEAD" ? "GET" : (args.request.method.toUpperCase() as Method);
    try {
      const handler = handlers[method];
      if (!handler) throw new MethodNotAllowedError(allowed);
      return await handler(args);
    } catch (thrown) {
      return apiAnswerFor(thrown);
    }
  };
  return { loader: answer, action: answer };
}
