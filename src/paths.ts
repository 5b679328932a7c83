// Every page the router mounts, by name, and the one way to write a link to it. The router
// (src/app/router.tsx) mounts these patterns and nothing else; screens build links with
// `pathTo('fieldPose', { id, poseId })`, so a link to a page that does not exist, or without the
// ids its pattern needs, does not type-check.
import { generatePath, type PathParam } from 'react-router-dom';

export const routes = {
  home: '/',
  signIn: '/sign-in',
  signUp: '/sign-up',
  confirmSignUp: '/sign-up/confirm/:token',
  forgotPassword: '/forgot-password',
  resetPassword: '/reset-password/:token',
  invitation: '/invite/:token',
  fieldSessions: '/field',
  newSession: '/field/sessions/new',
  fieldSession: '/field/sessions/:id',
  fieldPose: '/field/sessions/:id/poses/:poseId',
  vehicles: '/field/vehicles',
  // The vehicle setup page: `id` is a vehicle's id, or 'new' for a new vehicle.
  vehicle: '/field/vehicles/:id',
  sync: '/field/sync',
  desk: '/desk',
  // A vehicle at the desk (read-only: details, gauge points, sessions and their envelopes).
  deskVehicle: '/desk/vehicles/:id',
  deskSession: '/desk/sessions/:id',
  envelope: '/desk/envelopes/:id',
  compare: '/desk/compare',
  account: '/account',
  team: '/team',
} as const;

export type RouteName = keyof typeof routes;

type ParamsOf<N extends RouteName> = [PathParam<(typeof routes)[N]>] extends [never] ? [] : [params: Record<PathParam<(typeof routes)[N]>, string>];

/** The path of a named page: `pathTo('deskSession', { id })` // => '/desk/sessions/…' */
export function pathTo<N extends RouteName>(name: N, ...params: ParamsOf<N>): string {
  return generatePath(routes[name], params[0] as never);
}
