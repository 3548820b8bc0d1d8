#include "survey/runner.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <oneapi/tbb/global_control.h>
#include <oneapi/tbb/parallel_for.h>
#include <oneapi/tbb/task_arena.h>
#include <poll.h>
#include <signal.h>
#include <sys/prctl.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <iostream>
#include <map>
#include <mutex>
#include <new>
#include <thread>
#include <unordered_map>
#include <unordered_set>

#include "survey/journal.hpp"

namespace arcsieve::survey {
namespace {

using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point start) {
    return std::chrono::duration<double>(Clock::now() - start).count();
}

double monotonic_seconds() {
    return std::chrono::duration<double>(Clock::now().time_since_epoch()).count();
}

// The problem's identifying fields, for records the job itself could not write.
nlohmann::json bare_record(const ProblemSpec& problem) {
    nlohmann::json record = problem_to_json(problem);
    record.erase("generators");
    return record;
}

nlohmann::json failure_record(const ProblemSpec& problem, const std::string& status,
                              const std::string& message) {
    nlohmann::json record = bare_record(problem);
    record["status"] = status;
    record["error"] = message;
    return finish_record(std::move(record), problem);
}

unsigned effective_threads(unsigned requested) {
    if (requested > 0) return requested;
    return std::max(1u, std::thread::hardware_concurrency());
}

std::string signal_text(int signal_number) {
    const char* name = strsignal(signal_number);
    return fmt::format("signal {} ({})", signal_number, name ? name : "unknown");
}

// A running child: its pid, the read end of its result pipe and what it has sent so far.
struct Child {
    pid_t pid = -1;
    int fd = -1;
    std::size_t position = 0;
    std::string output;
    Clock::time_point started;
    std::optional<Clock::time_point> deadline;
    bool killed_for_time = false;
};

Child spawn_child(const ProblemSpec& problem, std::size_t position, const SurveyOptions& options,
                  unsigned inner_threads, const JobFunction& job) {
    int fds[2];
    if (::pipe2(fds, O_CLOEXEC) != 0) {
        throw std::runtime_error(std::string("cannot create a pipe: ") + std::strerror(errno));
    }
    std::cout.flush();
    std::cerr.flush();
    const pid_t parent = ::getpid();
    const pid_t pid = ::fork();
    if (pid < 0) {
        ::close(fds[0]);
        ::close(fds[1]);
        throw std::runtime_error(std::string("cannot fork: ") + std::strerror(errno));
    }
    if (pid == 0) {
        ::close(fds[0]);
        // A driver killed with SIGKILL cannot stop its children; the kernel does it for us.
        ::prctl(PR_SET_PDEATHSIG, SIGKILL);
        if (::getppid() != parent) ::_exit(5);
#if !defined(__SANITIZE_ADDRESS__)
        // The memory guard: an address-space limit, so allocation fails (bad_alloc, or GMP's
        // abort) instead of the machine swapping. AddressSanitizer reserves terabytes of
        // address space, so sanitizer builds skip it.
        if (options.memory_limit_megabytes > 0) {
            const rlim_t bytes = static_cast<rlim_t>(options.memory_limit_megabytes) << 20;
            const rlimit limit{bytes, bytes};
            ::setrlimit(RLIMIT_AS, &limit);
        }
#endif
        std::string text;
        {
            // The child starts its own TBB (the parent never does, so fork is safe for it).
            oneapi::tbb::global_control parallelism(
                oneapi::tbb::global_control::max_allowed_parallelism, inner_threads);
            nlohmann::json record;
            try {
                record = run_problem_guarded(problem, options.job, options.time_limit_seconds, job);
            } catch (const std::bad_alloc&) {
                record = failure_record(
                    problem, "memory",
                    fmt::format("memory limit of {} MB exceeded", options.memory_limit_megabytes));
            } catch (...) {
                record = failure_record(problem, "error", "unexpected failure in the job");
            }
            text = record.dump();
        }
        std::size_t done = 0;
        while (done < text.size()) {
            const ssize_t n = ::write(fds[1], text.data() + done, text.size() - done);
            if (n < 0 && errno == EINTR) continue;
            if (n <= 0) ::_exit(4);
            done += static_cast<std::size_t>(n);
        }
        ::_exit(0);
    }
    ::close(fds[1]);
    Child child;
    child.pid = pid;
    child.fd = fds[0];
    child.position = position;
    child.started = Clock::now();
    if (options.time_limit_seconds > 0) {
        // The child also gets the limit as a cooperative deadline; the kill is the backstop,
        // with a little grace for the child to write its own record.
        child.deadline = child.started +
                         std::chrono::duration_cast<Clock::duration>(std::chrono::duration<double>(
                             options.time_limit_seconds * 1.05 + 0.5));
    }
    return child;
}

nlohmann::json collect_child(Child& child, const ProblemSpec& problem,
                             const SurveyOptions& options) {
    int status = 0;
    while (::waitpid(child.pid, &status, 0) < 0 && errno == EINTR) {
    }
    const double elapsed = seconds_since(child.started);
    nlohmann::json record;
    if (child.killed_for_time) {
        record =
            failure_record(problem, "timeout",
                           fmt::format("time limit of {} s exceeded", options.time_limit_seconds));
    } else if (WIFSIGNALED(status)) {
        std::string message = "the job died of " + signal_text(WTERMSIG(status));
        if (options.memory_limit_megabytes > 0 && WTERMSIG(status) == SIGABRT) {
            message += fmt::format(", possibly at the memory limit of {} MB",
                                   options.memory_limit_megabytes);
        }
        record = failure_record(problem, "crashed", message);
    } else {
        bool parsed = false;
        if (WIFEXITED(status) && WEXITSTATUS(status) == 0) {
            try {
                record = nlohmann::json::parse(child.output);
                parsed = record.is_object();
            } catch (const nlohmann::json::parse_error&) {
            }
        }
        if (!parsed) {
            record = failure_record(problem, "crashed",
                                    fmt::format("the job exited with status {} without a record",
                                                WIFEXITED(status) ? WEXITSTATUS(status) : -1));
        }
    }
    if (!record.contains("seconds")) record["seconds"] = elapsed;
    return record;
}

std::size_t bounded_inner_threads(unsigned threads, std::size_t pending_count) {
    // Problems side by side use the cores; when fewer problems than cores remain, the rest of
    // the cores go to the parallel parts inside each problem.
    if (pending_count == 0) return 1;
    return std::max<std::size_t>(1, threads / std::min<std::size_t>(threads, pending_count));
}

void run_isolated_pool(const std::vector<ProblemSpec>& problems,
                       const std::vector<std::size_t>& pending, const SurveyOptions& options,
                       const JobFunction& job, JournalWriter& journal, ProgressMeter& meter,
                       std::size_t& failed) {
    const unsigned threads = effective_threads(options.threads);
    std::vector<Child> running;
    std::size_t next = 0;
    while (next < pending.size() || !running.empty()) {
        while (running.size() < threads && next < pending.size()) {
            const std::size_t position = pending[next];
            const unsigned inner =
                static_cast<unsigned>(bounded_inner_threads(threads, pending.size() - next));
            running.push_back(spawn_child(problems[position], position, options, inner, job));
            ++next;
        }
        std::vector<pollfd> polls;
        for (const auto& child : running) polls.push_back(pollfd{child.fd, POLLIN, 0});
        int timeout_ms = 500;
        const auto now = Clock::now();
        for (const auto& child : running) {
            if (child.deadline && !child.killed_for_time) {
                const auto left =
                    std::chrono::duration_cast<std::chrono::milliseconds>(*child.deadline - now);
                timeout_ms = std::clamp<int>(static_cast<int>(left.count()) + 1, 0, timeout_ms);
            }
        }
        const int ready = ::poll(polls.data(), polls.size(), timeout_ms);
        if (ready < 0 && errno != EINTR) {
            throw std::runtime_error(std::string("poll failed: ") + std::strerror(errno));
        }
        std::vector<std::size_t> finished;
        for (std::size_t i = 0; i < running.size(); ++i) {
            if (ready > 0 && (polls[i].revents & (POLLIN | POLLHUP | POLLERR))) {
                char buffer[1 << 16];
                const ssize_t n = ::read(running[i].fd, buffer, sizeof buffer);
                if (n > 0) {
                    running[i].output.append(buffer, static_cast<std::size_t>(n));
                } else if (n == 0 || errno != EINTR) {
                    finished.push_back(i);
                    continue;
                }
            }
            if (running[i].deadline && !running[i].killed_for_time &&
                Clock::now() >= *running[i].deadline) {
                ::kill(running[i].pid, SIGKILL);
                running[i].killed_for_time = true;
            }
        }
        for (auto it = finished.rbegin(); it != finished.rend(); ++it) {
            Child child = std::move(running[*it]);
            running.erase(running.begin() + static_cast<std::ptrdiff_t>(*it));
            ::close(child.fd);
            nlohmann::json record = collect_child(child, problems[child.position], options);
            const bool bad = record.value("status", "ok") != "ok";
            failed += bad ? 1 : 0;
            journal.append(record);
            meter.record_finished(bad);
        }
    }
}

void run_in_process(const std::vector<ProblemSpec>& problems,
                    const std::vector<std::size_t>& pending, const SurveyOptions& options,
                    const JobFunction& job, JournalWriter& journal, ProgressMeter& meter,
                    std::size_t& failed) {
    std::mutex mutex;
    oneapi::tbb::task_arena arena(static_cast<int>(effective_threads(options.threads)));
    arena.execute([&] {
        oneapi::tbb::parallel_for(
            oneapi::tbb::blocked_range<std::size_t>(0, pending.size(), 1),
            [&](const oneapi::tbb::blocked_range<std::size_t>& range) {
                for (std::size_t i = range.begin(); i != range.end(); ++i) {
                    const ProblemSpec& problem = problems[pending[i]];
                    nlohmann::json record =
                        run_problem_guarded(problem, options.job, options.time_limit_seconds, job);
                    const bool bad = record.value("status", "ok") != "ok";
                    std::lock_guard lock(mutex);
                    failed += bad ? 1 : 0;
                    journal.append(record);
                    meter.record_finished(bad);
                }
            },
            oneapi::tbb::simple_partitioner());
    });
}

std::string csv_field(const std::string& text) {
    if (text.find_first_of(",\"\n") == std::string::npos) return text;
    std::string quoted = "\"";
    for (char ch : text) {
        if (ch == '"') quoted += '"';
        quoted += ch;
    }
    return quoted + "\"";
}

std::string json_scalar_text(const nlohmann::json& value) {
    if (value.is_null()) return "";
    if (value.is_string()) return value.get<std::string>();
    return value.dump();
}

std::string format_duration(double seconds) {
    if (!std::isfinite(seconds) || seconds < 0) return "?";
    const auto total = static_cast<long long>(seconds + 0.5);
    if (total >= 3600) return fmt::format("{}h{:02}m", total / 3600, (total / 60) % 60);
    if (total >= 60) return fmt::format("{}m{:02}s", total / 60, total % 60);
    return fmt::format("{}s", total);
}

}  // namespace

nlohmann::json finish_record(nlohmann::json record, const ProblemSpec& problem) {
    record["problem_key"] = problem_key(problem);
    if (!record.contains("status")) record["status"] = record.contains("error") ? "error" : "ok";
    return record;
}

nlohmann::json without_timing(nlohmann::json record) {
    record.erase("seconds");
    if (record.contains("timings")) record.erase("timings");
    return record;
}

nlohmann::json run_problem_guarded(const ProblemSpec& problem, const JobOptions& options,
                                   double time_limit_seconds, const JobFunction& job) {
    const auto started = Clock::now();
    JobOptions limited = options;
    if (time_limit_seconds > 0) {
        limited.deadline = started + std::chrono::duration_cast<Clock::duration>(
                                         std::chrono::duration<double>(time_limit_seconds));
    }
    nlohmann::json record;
    try {
        record = job(problem, limited);
        if (!record.is_object()) {
            record = failure_record(problem, "error", "the job returned no record");
        }
    } catch (const InputError& error) {
        record = failure_record(problem, "error", std::string("bad problem: ") + error.what());
    } catch (const std::bad_alloc&) {
        record = failure_record(problem, "memory", "out of memory");
    } catch (const std::exception& error) {
        record = failure_record(problem, "error", error.what());
    }
    record = finish_record(std::move(record), problem);
    if (!record.contains("seconds")) record["seconds"] = seconds_since(started);
    return record;
}

nlohmann::json run_problem_isolated(const ProblemSpec& problem, const SurveyOptions& options,
                                    const JobFunction& job) {
    Child child = spawn_child(problem, 0, options, effective_threads(options.threads), job);
    while (true) {
        pollfd p{child.fd, POLLIN, 0};
        const int ready = ::poll(&p, 1, 200);
        if (ready > 0) {
            char buffer[1 << 16];
            const ssize_t n = ::read(child.fd, buffer, sizeof buffer);
            if (n > 0) {
                child.output.append(buffer, static_cast<std::size_t>(n));
                continue;
            }
            if (n == 0 || errno != EINTR) break;
        }
        if (child.deadline && !child.killed_for_time && Clock::now() >= *child.deadline) {
            ::kill(child.pid, SIGKILL);
            child.killed_for_time = true;
        }
    }
    ::close(child.fd);
    return collect_child(child, problem, options);
}

nlohmann::json make_manifest(const std::vector<ProblemSpec>& problems, const Shard& shard,
                             const std::vector<std::size_t>& members) {
    nlohmann::json manifest;
    manifest["format"] = "arcsieve survey directory, version 1";
    manifest["problems_digest"] = problems_digest(problems);
    manifest["problem_count"] = problems.size();
    manifest["shard"] = to_string(shard);
    auto& keys = manifest["assigned"] = nlohmann::json::array();
    auto& positions = manifest["positions"] = nlohmann::json::array();
    for (std::size_t position : members) {
        keys.push_back(problem_key(problems[position]));
        positions.push_back(position);
    }
    return manifest;
}

PreparedSurvey prepare_survey(const std::vector<ProblemSpec>& problems, const std::string& out_dir,
                              const Shard& shard, bool resume) {
    if (out_dir.empty()) throw InputError("a survey needs --out DIR");
    if (problems.empty()) throw InputError("the survey has no problems");
    check_no_duplicate_problems(problems);
    std::error_code error;
    std::filesystem::create_directories(out_dir, error);
    if (error || !std::filesystem::is_directory(out_dir)) {
        throw InputError("cannot create the output directory '" + out_dir + "'");
    }
    PreparedSurvey prepared;
    prepared.members = shard_members(problems, shard);
    const nlohmann::json manifest = make_manifest(problems, shard, prepared.members);
    const std::string manifest_path = out_dir + "/" + manifest_file;
    const std::string journal_path = out_dir + "/" + journal_file;
    if (std::filesystem::exists(manifest_path)) {
        if (!resume) {
            throw InputError("'" + out_dir +
                             "' already holds a survey: add --resume to continue it, or choose "
                             "another --out");
        }
        nlohmann::json existing;
        try {
            existing = nlohmann::json::parse(read_file(manifest_path));
        } catch (const nlohmann::json::parse_error&) {
            throw InputError("'" + manifest_path + "' is damaged");
        }
        if (existing.value("problems_digest", "") != manifest["problems_digest"] ||
            existing.value("shard", "") != manifest["shard"]) {
            throw InputError("'" + out_dir +
                             "' holds a different survey (other problems or shard); resume it "
                             "with the same problems and --shard");
        }
    } else {
        if (std::filesystem::exists(journal_path) && !resume) {
            throw InputError("'" + out_dir + "' already has records: add --resume");
        }
        write_file_atomically(manifest_path, manifest.dump(1) + "\n");
    }
    JournalContents journal = read_journal(journal_path);
    if (journal.torn_tail) {
        truncate_file(journal_path, journal.valid_bytes);
        prepared.torn_tail_dropped = true;
    }
    std::unordered_set<std::string> done;
    for (const auto& record : journal.records) {
        done.insert(record.value("problem_key", std::string()));
    }
    for (std::size_t position : prepared.members) {
        if (done.count(problem_key(problems[position]))) {
            ++prepared.already_done;
        } else {
            prepared.pending.push_back(position);
        }
    }
    return prepared;
}

std::string summary_csv(const std::vector<nlohmann::json>& records) {
    std::string out =
        "problem,family,N,curve,status,rank_lower,rank_upper,hit_coeffs,digits_a,digits_b,"
        "digits_c,materialised,verified,settled,seconds,error\n";
    for (const auto& r : records) {
        std::vector<std::string> fields;
        fields.push_back(r.value("problem_key", std::string()));
        fields.push_back(r.value("family", std::string()));
        fields.push_back(r.contains("N") ? json_scalar_text(r["N"]) : "");
        std::string curve;
        if (r.contains("curve")) {
            curve = r["curve"].is_string() ? r["curve"].get<std::string>() : r["curve"].dump();
        }
        fields.push_back(curve);
        fields.push_back(r.value("status", std::string()));
        const auto rank = r.value("rank", nlohmann::json());
        fields.push_back(rank.is_object() ? json_scalar_text(rank.value("lower", nlohmann::json()))
                                          : "");
        fields.push_back(rank.is_object() ? json_scalar_text(rank.value("upper", nlohmann::json()))
                                          : "");
        std::string coeffs;
        const auto hit = r.value("hit", nlohmann::json());
        if (hit.is_object() && hit.contains("coeffs") && hit["coeffs"].is_array()) {
            for (const auto& c : hit["coeffs"]) {
                if (!coeffs.empty()) coeffs += ' ';
                coeffs += json_scalar_text(c);
            }
        }
        fields.push_back(coeffs);
        const auto digits = r.value("digits", nlohmann::json());
        for (std::size_t i = 0; i < 3; ++i) {
            fields.push_back(digits.is_array() && digits.size() == 3 ? json_scalar_text(digits[i])
                                                                     : "");
        }
        const bool written =
            (r.contains("solution") && r["solution"].is_array()) || r.contains("solution_file");
        fields.push_back(written ? "yes" : "no");
        fields.push_back(r.contains("verified") ? json_scalar_text(r["verified"]) : "");
        fields.push_back(r.contains("settled") ? json_scalar_text(r["settled"]) : "");
        fields.push_back(r.contains("seconds") && r["seconds"].is_number()
                             ? fmt::format("{:.3f}", r["seconds"].get<double>())
                             : "");
        fields.push_back(r.value("error", std::string()));
        for (std::size_t i = 0; i < fields.size(); ++i) {
            if (i > 0) out += ',';
            out += csv_field(fields[i]);
        }
        out += "\n";
    }
    return out;
}

void finalise_survey(const std::vector<ProblemSpec>& problems,
                     const std::vector<std::size_t>& members, const std::string& out_dir) {
    const JournalContents journal = read_journal(out_dir + "/" + journal_file);
    std::unordered_map<std::string, const nlohmann::json*> by_key;
    for (const auto& record : journal.records) {
        // A record written twice (possible only if a driver was killed between appending and
        // noting it) is kept once: the first copy, identical up to timing.
        by_key.emplace(record.value("problem_key", std::string()), &record);
    }
    std::vector<nlohmann::json> ordered;
    std::string lines;
    for (std::size_t position : members) {
        const auto it = by_key.find(problem_key(problems[position]));
        if (it == by_key.end()) continue;
        ordered.push_back(*it->second);
        lines += it->second->dump() + "\n";
    }
    write_file_atomically(out_dir + "/" + results_file, lines);
    write_file_atomically(out_dir + "/" + summary_file, summary_csv(ordered));
}

SurveyReport run_survey(const std::vector<ProblemSpec>& problems, const SurveyOptions& options,
                        const JobFunction& job) {
    const auto started = Clock::now();
    const PreparedSurvey prepared =
        prepare_survey(problems, options.out_dir, options.shard, options.resume);
    SurveyReport report;
    report.assigned = prepared.members.size();
    report.already_done = prepared.already_done;
    report.torn_tail_dropped = prepared.torn_tail_dropped;
    {
        JournalWriter journal(options.out_dir + "/" + journal_file);
        ProgressMeter meter(prepared.members.size(), prepared.already_done, options.progress,
                            options.progress_interval_seconds);
        if (options.isolate) {
            run_isolated_pool(problems, prepared.pending, options, job, journal, meter,
                              report.failed);
        } else {
            run_in_process(problems, prepared.pending, options, job, journal, meter, report.failed);
        }
        meter.finish();
    }
    report.ran = prepared.pending.size();
    finalise_survey(problems, prepared.members, options.out_dir);
    report.seconds = seconds_since(started);
    return report;
}

ProgressMeter::ProgressMeter(std::size_t total, std::size_t already_done, ProgressStyle style,
                             double interval_seconds)
    : total_(total),
      done_(already_done),
      done_at_start_(already_done),
      style_(style),
      interval_(interval_seconds),
      started_(monotonic_seconds()) {
    if (style_ == ProgressStyle::automatic) {
        style_ = ::isatty(STDERR_FILENO) ? ProgressStyle::bar : ProgressStyle::lines;
    }
}

void ProgressMeter::record_finished(bool failed) {
    ++done_;
    failed_ += failed ? 1 : 0;
    const double now = monotonic_seconds();
    const double gap = style_ == ProgressStyle::bar ? 0.2 : interval_;
    if (now - last_print_ >= gap) print(false);
}

void ProgressMeter::finish() {
    if (style_ == ProgressStyle::quiet) return;
    print(true);
}

void ProgressMeter::print(bool final) {
    if (style_ == ProgressStyle::quiet) return;
    const double now = monotonic_seconds();
    last_print_ = now;
    const double elapsed = now - started_;
    const std::size_t ran = done_ - done_at_start_;
    const double rate = elapsed > 0 ? static_cast<double>(ran) / elapsed : 0;
    const double eta = rate > 0 ? static_cast<double>(total_ - done_) / rate : NAN;
    const double fraction = total_ ? static_cast<double>(done_) / static_cast<double>(total_) : 1;
    const std::string failed_text = failed_ ? fmt::format(", {} failed", failed_) : "";
    if (style_ == ProgressStyle::bar) {
        constexpr int width = 30;
        const int filled = static_cast<int>(fraction * width);
        std::cerr << fmt::format("\r[{}{}] {}/{} {:5.1f}%  {:.2f} problems/s  ETA {}{}   ",
                                 std::string(filled, '#'), std::string(width - filled, '.'), done_,
                                 total_, 100 * fraction, rate,
                                 final ? "done" : format_duration(eta), failed_text);
        if (final) std::cerr << "\n";
    } else {
        std::cerr << fmt::format("survey: {}/{} done ({:.1f}%), {:.2f} problems/s, {} {}{}\n",
                                 done_, total_, 100 * fraction, rate, final ? "finished in" : "ETA",
                                 final ? format_duration(elapsed) : format_duration(eta),
                                 failed_text);
    }
    std::cerr.flush();
}

}  // namespace arcsieve::survey
