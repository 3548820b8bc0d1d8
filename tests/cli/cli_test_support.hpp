// Test-only helpers for tests that run the built arcsieve binaries: running a command line and
// capturing its output and exit code, and a small XML reader to check SVG output structurally.
#pragma once

#include <sys/wait.h>

#include <array>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <map>
#include <stdexcept>
#include <string>
#include <vector>

namespace arcsieve::cli_testing {

struct CommandResult {
    int exit_code = -1;
    std::string output;  // stdout, and stderr when merged
};

inline CommandResult run_command(const std::string& command, bool merge_stderr = true) {
    CommandResult result;
    FILE* pipe = ::popen((command + (merge_stderr ? " 2>&1" : " 2>/dev/null")).c_str(), "r");
    if (!pipe) throw std::runtime_error("popen failed");
    std::array<char, 4096> buffer;
    std::size_t n;
    while ((n = std::fread(buffer.data(), 1, buffer.size(), pipe)) > 0) {
        result.output.append(buffer.data(), n);
    }
    const int status = ::pclose(pipe);
    result.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
    return result;
}

inline std::string binary() {
    return ARCSIEVE_BINARY;
}
inline std::string mpi_binary() {
    return (std::filesystem::path(ARCSIEVE_BINARY).parent_path() / "arcsieve-mpi").string();
}

inline bool sanitizer_scale() {
    const char* scale = std::getenv("ARCSIEVE_TEST_SCALE");
    return scale && std::string(scale) == "sanitize";
}

// A minimal XML reader: elements with attributes, properly nested, text ignored. Enough to
// check that an SVG is well formed and to count its parts. Throws std::runtime_error on
// malformed input.
struct XmlElement {
    std::string name;
    std::map<std::string, std::string> attributes;
    std::vector<XmlElement> children;
    std::string text;
};

inline void collect(const XmlElement& e, const std::string& name,
                    std::vector<const XmlElement*>& out) {
    if (e.name == name) out.push_back(&e);
    for (const auto& c : e.children) collect(c, name, out);
}

inline std::vector<const XmlElement*> find_all(const XmlElement& root, const std::string& name) {
    std::vector<const XmlElement*> out;
    collect(root, name, out);
    return out;
}

inline XmlElement parse_xml(const std::string& text) {
    std::size_t i = 0;
    auto fail = [&](const std::string& what) {
        throw std::runtime_error("XML error at byte " + std::to_string(i) + ": " + what);
    };
    auto skip_space = [&] {
        while (i < text.size() && std::isspace(static_cast<unsigned char>(text[i]))) ++i;
    };
    if (text.compare(0, 5, "<?xml") == 0) {
        i = text.find("?>");
        if (i == std::string::npos) fail("unterminated declaration");
        i += 2;
    }
    std::vector<XmlElement> stack;
    std::optional<XmlElement> root;
    while (i < text.size()) {
        if (text[i] != '<') {
            const std::size_t next = text.find('<', i);
            const std::string chunk = text.substr(i, next - i);
            if (!stack.empty())
                stack.back().text += chunk;
            else if (chunk.find_first_not_of(" \t\r\n") != std::string::npos)
                fail("text outside root");
            if (chunk.find('<') != std::string::npos || chunk.find('>') != std::string::npos)
                fail("stray bracket");
            i = next == std::string::npos ? text.size() : next;
            continue;
        }
        if (text.compare(i, 2, "</") == 0) {
            const std::size_t end = text.find('>', i);
            if (end == std::string::npos) fail("unterminated end tag");
            const std::string name = text.substr(i + 2, end - i - 2);
            if (stack.empty() || stack.back().name != name) fail("mismatched </" + name + ">");
            XmlElement done = std::move(stack.back());
            stack.pop_back();
            if (stack.empty()) {
                if (root) fail("two roots");
                root = std::move(done);
            } else {
                stack.back().children.push_back(std::move(done));
            }
            i = end + 1;
            continue;
        }
        ++i;
        XmlElement element;
        while (i < text.size() && !std::isspace(static_cast<unsigned char>(text[i])) &&
               text[i] != '>' && text[i] != '/') {
            element.name += text[i++];
        }
        if (element.name.empty()) fail("empty tag name");
        bool self_closing = false;
        while (true) {
            skip_space();
            if (i >= text.size()) fail("unterminated tag");
            if (text[i] == '/') {
                if (text.compare(i, 2, "/>") != 0) fail("bad '/'");
                self_closing = true;
                i += 2;
                break;
            }
            if (text[i] == '>') {
                ++i;
                break;
            }
            std::string key;
            while (i < text.size() && text[i] != '=' &&
                   !std::isspace(static_cast<unsigned char>(text[i])))
                key += text[i++];
            skip_space();
            if (i >= text.size() || text[i] != '=') fail("attribute without value: " + key);
            ++i;
            skip_space();
            if (i >= text.size() || text[i] != '"') fail("unquoted attribute " + key);
            const std::size_t close = text.find('"', i + 1);
            if (close == std::string::npos) fail("unterminated attribute");
            const std::string value = text.substr(i + 1, close - i - 1);
            if (value.find('<') != std::string::npos) fail("'<' in attribute");
            if (!element.attributes.emplace(key, value).second) fail("duplicate attribute " + key);
            i = close + 1;
        }
        if (self_closing) {
            if (stack.empty()) fail("self-closing root");
            stack.back().children.push_back(std::move(element));
        } else {
            stack.push_back(std::move(element));
        }
    }
    if (!stack.empty()) fail("unclosed <" + stack.back().name + ">");
    if (!root) fail("no root element");
    return *root;
}

}  // namespace arcsieve::cli_testing
