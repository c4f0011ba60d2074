/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** The signed-in person, or null. Set by the middleware on every request. */
    user: import('./lib/server/identity').SignedInUser | null;
    /** A test station authenticated by its bearer token, or null. */
    station: import('./lib/server/identity').StationIdentity | null;
  }
}
