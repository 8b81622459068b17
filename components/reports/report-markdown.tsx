import ReactMarkdown, { type Components } from "react-markdown";
import remarkGfm from "remark-gfm";
import { cn } from "@/lib/cn";

/*
 * The lab's markdown (report write-ups, lab notes): GitHub tables and lists. Raw HTML is never
 * rendered as HTML — there is no rehype-raw, so react-markdown turns an HTML block such as
 * `<script>` into plain visible text. react-markdown's default URL check drops javascript: and
 * other unsafe links. Images become links so a write-up cannot make readers fetch third-party URLs.
 */
const components: Components = {
  a: ({ node: _node, ...props }) => <a {...props} rel="nofollow noopener noreferrer" />,
  img: ({ src, alt }) =>
    typeof src === "string" && src ? (
      <a href={src} rel="nofollow noopener noreferrer">
        {alt ? `Image: ${alt}` : "Image link"}
      </a>
    ) : null,
};

export function ReportMarkdown({ markdown, className, empty = "Nothing written yet." }: { markdown: string; className?: string; empty?: string }) {
  if (!markdown.trim()) return <p className={cn("text-muted", className)}>{empty}</p>;
  return (
    <div className={cn("prose-lab break-words [&>*:first-child]:mt-0! [&>*:last-child]:mb-0!", className)}>
      <ReactMarkdown remarkPlugins={[remarkGfm]} components={components}>
        {markdown}
      </ReactMarkdown>
    </div>
  );
}
