#include "tidewright/study/option_names.hpp"

namespace tidewright::study {

const NameTable<RecordKind>& record_kind_names() {
  static const NameTable<RecordKind> t{
      {"detect", RecordKind::detect}, {"series", RecordKind::series}, {"annual-maxima", RecordKind::annual_maxima}};
  return t;
}

const NameTable<record::DetrendMethod>& detrend_names() {
  static const NameTable<record::DetrendMethod> t = [] {
    NameTable<record::DetrendMethod> out;
    for (auto m : {record::DetrendMethod::none, record::DetrendMethod::annual_mean, record::DetrendMethod::linear}) {
      out.emplace_back(std::string(record::detrend_method_name(m)), m);
    }
    return out;
  }();
  return t;
}

const NameTable<climate::IceStoryline>& storyline_names() {
  static const NameTable<climate::IceStoryline> t{{"assessed", climate::IceStoryline::assessed},
                                                  {"high-end-ice", climate::IceStoryline::high_end_ice}};
  return t;
}

const NameTable<ScenarioSource>& scenario_source_names() {
  static const NameTable<ScenarioSource> t{{"pathway", ScenarioSource::pathway},
                                           {"forcing-csv", ScenarioSource::forcing_csv},
                                           {"co2-csv", ScenarioSource::co2_csv},
                                           {"temperature-csv", ScenarioSource::temperature_csv},
                                           {"table", ScenarioSource::table}};
  return t;
}

}  // namespace tidewright::study
