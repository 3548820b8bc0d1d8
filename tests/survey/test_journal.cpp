// The crash-safe journal: durable appends, torn last lines dropped, damage elsewhere refused.
#include <gtest/gtest.h>

#include <fstream>

#include "survey/journal.hpp"
#include "survey_test_support.hpp"

namespace arcsieve::survey {
namespace {

using testing::TemporaryDirectory;

void append_raw(const std::string& path, const std::string& bytes) {
    std::ofstream out(path, std::ios::binary | std::ios::app);
    out << bytes;
}

TEST(JournalTest, AppendedRecordsReadBackInOrder) {
    TemporaryDirectory dir("journal");
    const std::string path = dir.path + "/j.jsonl";
    {
        JournalWriter writer(path);
        for (int i = 0; i < 5; ++i) writer.append({{"i", i}});
    }
    const auto contents = read_journal(path);
    ASSERT_EQ(contents.records.size(), 5u);
    EXPECT_EQ(contents.records[3]["i"], 3);
    EXPECT_FALSE(contents.torn_tail);
    EXPECT_EQ(contents.valid_bytes, read_file(path).size());
}

TEST(JournalTest, MissingFileIsEmpty) {
    const auto contents = read_journal("/nonexistent/arcsieve/journal.jsonl");
    EXPECT_TRUE(contents.records.empty());
    EXPECT_FALSE(contents.torn_tail);
}

TEST(JournalTest, TornLastLineIsDetectedAndCanBeCut) {
    TemporaryDirectory dir("journal");
    const std::string path = dir.path + "/j.jsonl";
    {
        JournalWriter writer(path);
        writer.append({{"i", 0}});
        writer.append({{"i", 1}});
    }
    const std::size_t good = read_file(path).size();
    append_raw(path, "{\"i\": 2, \"long");  // what a kill in the middle of write() leaves
    auto contents = read_journal(path);
    EXPECT_TRUE(contents.torn_tail);
    EXPECT_EQ(contents.records.size(), 2u);
    EXPECT_EQ(contents.valid_bytes, good);
    truncate_file(path, contents.valid_bytes);
    {
        JournalWriter writer(path);
        writer.append({{"i", 2}});
    }
    contents = read_journal(path);
    EXPECT_FALSE(contents.torn_tail);
    ASSERT_EQ(contents.records.size(), 3u);
    EXPECT_EQ(contents.records[2]["i"], 2);
}

TEST(JournalTest, UnparseableFinalLineWithNewlineCountsAsTorn) {
    TemporaryDirectory dir("journal");
    const std::string path = dir.path + "/j.jsonl";
    append_raw(path, "{\"i\":0}\n{\"i\":\n");
    const auto contents = read_journal(path);
    EXPECT_TRUE(contents.torn_tail);
    EXPECT_EQ(contents.records.size(), 1u);
}

TEST(JournalTest, DamageInTheMiddleIsRefused) {
    TemporaryDirectory dir("journal");
    const std::string path = dir.path + "/j.jsonl";
    append_raw(path, "{\"i\":0}\ngarbage\n{\"i\":2}\n");
    EXPECT_THROW(read_journal(path), InputError);
}

TEST(JournalTest, AtomicWriteReplacesWholeFile) {
    TemporaryDirectory dir("journal");
    const std::string path = dir.path + "/f.txt";
    write_file_atomically(path, "first version, longer\n");
    write_file_atomically(path, "second\n");
    EXPECT_EQ(read_file(path), "second\n");
    EXPECT_FALSE(std::filesystem::exists(path + ".partial"));
}

}  // namespace
}  // namespace arcsieve::survey
