import Link from "next/link";

export default function JointNotFound() {
  return (
    <div className="mx-auto flex max-w-xl flex-col gap-2">
      <h1 className="text-2xl font-bold">No such joint</h1>
      <p>There is no joint with that number. Joints are never deleted, so check the link.</p>
      <Link href="/" className="font-semibold text-brand underline">
        Back to Today
      </Link>
    </div>
  );
}
