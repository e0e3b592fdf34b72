#include "tests/bench/sample_text.h"

#include <string_view>

namespace chute::bench {

namespace {

// All paragraphs below were written for this benchmark; the names, numbers
// and places in them are invented.
constexpr std::string_view kEnglish[] = {
    "Dear Sir or Madam, I am writing about the building permit for the "
    "garage at 14 Orchard Lane (reference BP-2023-04417). The inspection "
    "that was booked for 12 March did not take place, and nobody has called "
    "to arrange a new date. The contractor cannot pour the foundation until "
    "the inspector has signed the form, and every week of delay costs us "
    "about $1,250. Could you please tell me when an inspector will be "
    "available?\n\n",
    "Claim no. 88-31207: on 3 February 2024 a burst pipe flooded the ground "
    "floor of the property. The loss adjuster visited on the 9th and "
    "estimated the damage at EUR 14,380.50, but the settlement letter of 2 "
    "April offers only 9,100. I enclose the plumber's invoice, twelve "
    "photographs and the adjuster's own notes. I ask that the claim be "
    "reviewed and that the difference be paid within 30 days.\n\n",
    "Hello, my direct debit was taken twice this month (27.50 on the 1st and "
    "again on the 3rd). Account number 0042-7781-19. I have already rung the "
    "helpline, waited 45 minutes and was told to write in. Please refund the "
    "duplicate payment and confirm by e-mail to j.morrow@example.org. "
    "Thanks, Jane Morrow\n\n",
    "To the records office: under the access-to-information rules I request "
    "copies of all correspondence between the planning department and "
    "Westbridge Holdings Ltd. concerning the site at Mill Road between 1 "
    "January 2021 and 31 December 2022, including minutes of meetings, "
    "e-mails and any notes of telephone calls. Electronic copies are fine. "
    "If a fee applies, please tell me before you start.\n\n",
    "I wish to appeal against the decision dated 18/06/2024 to refuse my "
    "application for a market trader's licence. The refusal letter says the "
    "pitch plan was missing, but it was attached to the original form as "
    "page 3 of 4. I was not given the chance to correct the error before the "
    "decision was made, which I believe is unfair. I would like the appeal "
    "to be heard in person if possible.\n\n",
    "Complaint about the noise from the construction site next to our block. "
    "Work starts at 6:30 every morning, including Saturdays, although the "
    "notice on the fence says 8:00-18:00 Monday to Friday. Several residents "
    "have young children and night-shift jobs. We have kept a diary of the "
    "times over the last three weeks and can send it. We would like the "
    "council to enforce the agreed working hours.\n\n",
};

constexpr std::string_view kEuropean[] = {
    "Sehr geehrte Damen und Herren, hiermit beantrage ich die Verlängerung "
    "meiner Aufenthaltserlaubnis, die am 30.09.2024 abläuft. Die nötigen "
    "Unterlagen (Reisepass, Arbeitsvertrag, Mietbescheinigung und "
    "Krankenversicherungsnachweis) liegen bei. Für Rückfragen erreichen Sie "
    "mich werktags unter der unten angegebenen Nummer. Mit freundlichen "
    "Grüßen, Jürgen Weiß, Straße des 17. Juni 112, Berlin.\n\n",
    "Madame, Monsieur, je me permets de vous écrire au sujet de la facture "
    "n° 2024-118 reçue le 4 mars. Le montant réclamé (312,40 €) ne "
    "correspond pas au relevé de consommation : le compteur indiquait 4 512 "
    "kWh et non 5 412. Pourriez-vous vérifier le relevé et m'envoyer une "
    "facture rectifiée ? Je reste à votre disposition. Cordialement, Hélène "
    "Lefèvre.\n\n",
    "Estimados señores: les escribo para presentar una reclamación por el "
    "retraso en la tramitación de mi solicitud de licencia de obra, "
    "registrada el 15 de enero con el número 2024/00731. Han pasado más de "
    "tres meses sin respuesta y el presupuesto del constructor caduca a "
    "finales de mayo. Les ruego que me informen del estado del expediente. "
    "Atentamente, José Ángel Muñoz.\n\n",
};

constexpr std::string_view kCyrillicGreek[] = {
    "Уважаемые господа! Прошу рассмотреть мою жалобу на задержку выплаты по "
    "страховому случаю № 4471 от 12 февраля. Все документы, включая акт "
    "осмотра и фотографии повреждений, были переданы вашему сотруднику ещё в "
    "марте. С уважением, Ольга Петрова.\n\n",
    "Αξιότιμοι κύριοι, σας γράφω σχετικά με την αίτηση άδειας λειτουργίας "
    "του καταστήματος στην οδό Ερμού 45. Η αίτηση υποβλήθηκε στις 3 Απριλίου "
    "με αριθμό πρωτοκόλλου 1187, αλλά δεν έχω λάβει καμία απάντηση. "
    "Παρακαλώ ενημερώστε με για την πορεία της. Με εκτίμηση, Νίκος "
    "Παπαδόπουλος.\n\n",
};

constexpr std::string_view kCjk[] = {
    "お世話になっております。先月提出した建築確認申請（受付番号２０２４－０３１５）"
    "について、審査の進み具合を教えていただけますでしょうか。工事の開始予定日が"
    "近づいておりますので、必要な追加書類があればご連絡ください。よろしくお願い"
    "いたします。\n\n",
    "您好！我于三月五日提交了营业执照变更申请，受理编号为２０２４０３０５０１２。"
    "至今已超过三十个工作日，仍未收到任何通知。请告知目前的办理进度，以及是否需要"
    "补充材料。谢谢！\n\n",
};

template <size_t N>
std::string RepeatAll(const std::string_view (&paragraphs)[N],
                      size_t min_bytes) {
  std::string text;
  while (text.size() < min_bytes) {
    for (std::string_view p : paragraphs) text.append(p);
  }
  return text;
}

}  // namespace

std::string EnglishText(size_t min_bytes) {
  return RepeatAll(kEnglish, min_bytes);
}

std::string EuropeanText(size_t min_bytes) {
  return RepeatAll(kEuropean, min_bytes);
}

std::string CyrillicGreekText(size_t min_bytes) {
  return RepeatAll(kCyrillicGreek, min_bytes);
}

std::string CjkText(size_t min_bytes) { return RepeatAll(kCjk, min_bytes); }

std::string MixedText(size_t min_bytes) {
  // 20 paragraphs: 16 English, 3 European, 1 non-Latin (alternating
  // Cyrillic/Greek and CJK between rounds).
  std::string text;
  size_t round = 0;
  while (text.size() < min_bytes) {
    for (size_t i = 0; i < 16; ++i) {
      text.append(kEnglish[(round * 16 + i) % std::size(kEnglish)]);
      if (i % 5 == 4) {
        text.append(kEuropean[(round * 3 + i / 5) % std::size(kEuropean)]);
      }
    }
    if (round % 2 == 0) {
      text.append(kCyrillicGreek[(round / 2) % std::size(kCyrillicGreek)]);
    } else {
      text.append(kCjk[(round / 2) % std::size(kCjk)]);
    }
    ++round;
  }
  return text;
}

}  // namespace chute::bench
