import ReactMarkdown, { type Components } from "react-markdown";
import remarkGfm from "remark-gfm";
import { cn } from "@/lib/cn";

/*
 * Markdown written by supporters. Raw HTML is dropped (skipHtml, and no rehype-raw), react-markdown's
 * default URL check removes javascript: and other unsafe links, and images become plain links so a
 * description cannot make every reader's browser fetch a third-party address.
 */
const components: Components = {
  a: ({ node: _node, ...props }) => <a {...props} rel="ugc nofollow noopener noreferrer" />,
  img: ({ src, alt }) =>
    typeof src === "string" && src ? (
      <a href={src} rel="ugc nofollow noopener noreferrer">
        {alt ? `Image: ${alt}` : "Image link"}
      </a>
    ) : null,
};

export function Markdown({ children, className }: { children: string; className?: string }) {
  return (
    <div className={cn("prose-lab break-words [&>*:first-child]:mt-0! [&>*:last-child]:mb-0!", className)}>
      <ReactMarkdown remarkPlugins={[remarkGfm]} skipHtml components={components}>
        {children}
      </ReactMarkdown>
    </div>
  );
}
