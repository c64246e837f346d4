/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    user: import('./features/auth/users.server').SessionUser | null;
  }
}
