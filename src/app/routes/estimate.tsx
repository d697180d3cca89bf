// Placeholder: built in issue 6.
export default function Screen() {
  return <p>Coming soon</p>;
}
