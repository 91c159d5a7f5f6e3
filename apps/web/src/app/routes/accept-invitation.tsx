export default function AcceptInvitationRoute() {
  return null;
}
